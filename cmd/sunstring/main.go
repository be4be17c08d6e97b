// Command sunstring estimates the yield of a shaded PV roof and ranks string layouts.
package main

import (
	"context"
	"fmt"
	"os"
	"os/signal"
	"syscall"

	"sunstring/cmd/sunstring/internal/cli"
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM, syscall.SIGHUP)
	err := cli.NewRoot().ExecuteContext(ctx)
	stop()
	if err != nil {
		fmt.Fprintln(os.Stderr, "sunstring:", err)
	}
	os.Exit(cli.ExitCode(err))
}
