package cli

import (
	"context"
	"errors"
	"strings"
	"time"
)

func contextWithTimeout(ctx context.Context, d time.Duration) (context.Context, context.CancelFunc) {
	return context.WithTimeout(ctx, d)
}

func joinLines(lines []string) error { return errors.New(strings.Join(lines, "\n")) }
