package electric

import (
	"errors"
	"fmt"
)

// ErrNoFit is returned (wrapped) when datasheet values admit no physical
// single-diode parameter set (positive I0, Rs ≥ 0, Rsh > 0).
var ErrNoFit = errors.New("electric: datasheet values admit no single-diode fit")

// InputError reports a bad input value. Field is a dotted path such as
// "module.vmp_v" so the command line can point at the offending key.
type InputError struct {
	Field string
	Msg   string
}

func (e *InputError) Error() string { return fmt.Sprintf("%s: %s", e.Field, e.Msg) }

// BadInput reports whether the error was caused by user input (always true);
// the command line maps it to exit status 2.
func (e *InputError) BadInput() bool { return true }

func badf(field, format string, args ...any) error {
	return &InputError{Field: field, Msg: fmt.Sprintf(format, args...)}
}
