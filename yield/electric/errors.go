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

// ErrOutOfModel is wrapped by errors about values that the caller computed, not read from
// a user's file, and that lie outside the model's range: a cell irradiance or temperature
// the curves cannot take, a step of no length. Such an error is a fault of the program
// that fed the model (exit status 1), so it deliberately does not implement BadInput.
var ErrOutOfModel = errors.New("electric: value outside the model's range")

func outOfModelf(field, format string, args ...any) error {
	return fmt.Errorf("%w: %s: %s", ErrOutOfModel, field, fmt.Sprintf(format, args...))
}
