// Command sunstring estimates the yield of a shaded PV roof and ranks string layouts.
package main

import (
	"context"
	"fmt"
	"os"
	"os/signal"

	"sunstring/cmd/sunstring/internal/cli"
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	err := cli.NewRoot().ExecuteContext(ctx)
	stop()
	if err != nil {
		fmt.Fprintln(os.Stderr, "sunstring:", err)
	}
	os.Exit(cli.ExitCode(err))
}
