package cli

import (
	"errors"
	"fmt"
	"io"
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
	if err := regular(path, what, st); err != nil {
		return nil, err
	}
	if st.Size() > maxInputBytes {
		return nil, inputError{fmt.Errorf("%s: the %s is %d MB; at most %d MB is accepted", path, what, st.Size()>>20, maxInputBytes>>20)}
	}
	f, err := os.Open(path)
	if err != nil {
		return nil, inputError{fmt.Errorf("%s: cannot read the %s: %w", path, what, err)}
	}
	defer f.Close()
	// The file may have been replaced or grown since Stat: read at most one byte past the limit.
	b, err := io.ReadAll(io.LimitReader(f, maxInputBytes+1))
	if err != nil {
		return nil, inputError{fmt.Errorf("%s: cannot read the %s: %w", path, what, err)}
	}
	if len(b) > maxInputBytes {
		return nil, inputError{fmt.Errorf("%s: the %s is larger than %d MB, the most accepted", path, what, maxInputBytes>>20)}
	}
	return b, nil
}

// regular refuses anything but a regular file: a named pipe would block the read (and with it
// Ctrl-C), and a device such as /dev/zero never ends.
func regular(path, what string, st os.FileInfo) error {
	m := st.Mode()
	if m.IsRegular() {
		return nil
	}
	kind := "not a regular file"
	switch {
	case m&os.ModeNamedPipe != 0:
		kind = "a named pipe"
	case m&os.ModeSocket != 0:
		kind = "a socket"
	case m&os.ModeDevice != 0 || m&os.ModeCharDevice != 0:
		kind = "a device"
	}
	return inputError{fmt.Errorf("%s: the %s is %s; give a regular file", path, what, kind)}
}

// siteFile refuses a site path that is not a regular file before the site-file reader opens
// it; a missing file is left to the reader's own message.
func siteFile(path string) error {
	st, err := os.Stat(path)
	if err != nil || st.IsDir() {
		return nil
	}
	return regular(path, "site file", st)
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
	if err := siteFile(path); err != nil {
		return nil, err
	}
	cfg, err := config.Load(path, flags, bind)
	if err != nil {
		return nil, err
	}
	return survey.Load(cfg, readInput)
}
