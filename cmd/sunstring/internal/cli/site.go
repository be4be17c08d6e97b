package cli

import (
	"errors"
	"fmt"
	"os"

	"github.com/spf13/pflag"

	"sunstring/cmd/sunstring/internal/config"
	"sunstring/yield/survey"
)

// inputError is a problem with a file the user named.
type inputError struct{ error }

func (inputError) BadInput() bool { return true }

// maxInputBytes bounds what is read of any one input file: a map or a weather year is a few
// megabytes; anything far larger is a mistake and must not exhaust memory.
const maxInputBytes = 64 << 20

// readInput reads a user's file whole, with a clear message when it is missing, a folder or
// too large.
func readInput(path, what string) ([]byte, error) {
	st, err := os.Stat(path)
	if err != nil {
		var pe *os.PathError
		if errors.As(err, &pe) {
			return nil, inputError{fmt.Errorf("%s: cannot read the %s: %v", path, what, pe.Err)}
		}
		return nil, inputError{fmt.Errorf("%s: cannot read the %s: %w", path, what, err)}
	}
	if st.IsDir() {
		return nil, inputError{fmt.Errorf("%s: the %s is a folder, not a file", path, what)}
	}
	if st.Size() > maxInputBytes {
		return nil, inputError{fmt.Errorf("%s: the %s is %d MB; at most %d MB is accepted", path, what, st.Size()>>20, maxInputBytes>>20)}
	}
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, inputError{fmt.Errorf("%s: cannot read the %s: %w", path, what, err)}
	}
	return b, nil
}

// siteFlags are the flags that override site-file keys, shared by the commands that read one.
func bindSiteFlags(f *pflag.FlagSet) map[string]string {
	f.String("weather", "", "weather file (EPW or CSV), relative to the current folder; overrides climate.file")
	f.String("orientation", "", "module orientation: portrait, landscape or best (overrides fill.orientation)")
	f.Float64("setback", 0, "setback from every roof edge, m (overrides fill.setback_m)")
	f.String("sky", "", "sky model: perez, hay-davies or isotropic (overrides model.sky)")
	return map[string]string{"climate.file": "weather", "fill.orientation": "orientation", "fill.setback_m": "setback", "model.sky": "sky"}
}

// loadProject reads and validates the site file (with the flags bound to its keys and the
// SUNSTRING_ environment), then loads the map and places the modules.
func loadProject(path string, flags *pflag.FlagSet, bind map[string]string) (*survey.Project, error) {
	cfg, err := config.Load(path, flags, bind)
	if err != nil {
		return nil, err
	}
	return survey.Load(cfg, readInput)
}
