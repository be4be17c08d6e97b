package cli

import (
	"errors"
	"fmt"
	"strings"

	"github.com/spf13/cobra"
)

// Version is set at build time with -ldflags "-X sunstring/cmd/sunstring/internal/cli.Version=...".
var Version = "0.1.0-dev"

// usageError is a mistake in how the command was called.
type usageError struct{ error }

func (usageError) BadInput() bool { return true }

// ExitCode maps an error to the exit status: 0 done, 2 bad input or usage, 1 anything else.
func ExitCode(err error) int {
	if err == nil {
		return 0
	}
	var bi interface{ BadInput() bool }
	if errors.As(err, &bi) && bi.BadInput() {
		return 2
	}
	// cobra reports an unknown subcommand with a plain error of its own.
	if strings.HasPrefix(err.Error(), "unknown command ") {
		return 2
	}
	return 1
}

// NewRoot builds the command tree.
func NewRoot() *cobra.Command {
	root := &cobra.Command{
		Use:   "sunstring",
		Short: "Shade-aware yield estimates and string layouts for PV roofs",
		Long: `sunstring turns a roof drawn on a map (GeoJSON) and a site file (YAML) into a
yield estimate for a PV system: it places modules on each roof face, finds when every
cell of every module is shaded over a year, simulates what that shade does to the
strings and the inverter, ranks string layouts, and writes a summary, charts, a
GeoJSON of the modules and a customer proposal.

Estimates only: local codes and a licensed installer have the final word.`,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error {
		return usageError{fmt.Errorf("%w (see '%s --help')", err, c.CommandPath())}
	})
	root.AddCommand(newVersionCmd(), newSunCmd(), newCheckCmd(), newSurveyCmd(), newClimateCmd(), newSkyCmd())
	return root
}

// args wraps a cobra argument validator so that its errors count as usage errors.
func args(v cobra.PositionalArgs) cobra.PositionalArgs {
	return func(c *cobra.Command, a []string) error {
		if err := v(c, a); err != nil {
			return usageError{fmt.Errorf("%w (see '%s --help')", err, c.CommandPath())}
		}
		return nil
	}
}

func newVersionCmd() *cobra.Command {
	return &cobra.Command{
		Use:   "version",
		Short: "Print the version",
		Args:  args(cobra.NoArgs),
		RunE: func(c *cobra.Command, _ []string) error {
			_, err := fmt.Fprintf(c.OutOrStdout(), "sunstring %s\n", Version)
			return err
		},
	}
}
