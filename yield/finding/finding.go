package finding

import (
	"errors"
	"fmt"
	"slices"
	"strings"
)

// Severity says how much a Finding matters. The zero value is Info. Higher is worse, so that
// sorting by severity, worst first, is a descending sort.
type Severity int

// The severities, mildest first.
const (
	// Info is worth knowing; nothing needs doing.
	Info Severity = iota
	// Warning lets the survey run, but a person must look before the proposal goes out.
	Warning
	// Fail stops the survey: exit status 2.
	Fail
)

var severityNames = [...]string{Info: "info", Warning: "warning", Fail: "fail"}

// String returns "info", "warning" or "fail".
func (s Severity) String() string {
	if s < Info || s > Fail {
		return fmt.Sprintf("severity(%d)", int(s))
	}
	return severityNames[s]
}

// MarshalText writes the severity's word, as summary.json and check --json show it.
func (s Severity) MarshalText() ([]byte, error) {
	if s < Info || s > Fail {
		return nil, fmt.Errorf("finding: no severity %d", int(s))
	}
	return []byte(s.String()), nil
}

// UnmarshalText reads a severity's word.
func (s *Severity) UnmarshalText(b []byte) error {
	v, err := ParseSeverity(string(b))
	if err != nil {
		return err
	}
	*s = v
	return nil
}

// ErrUnknownSeverity is wrapped when a word names no severity.
var ErrUnknownSeverity = errors.New("finding: unknown severity")

// ParseSeverity reads "info", "warning" or "fail".
func ParseSeverity(word string) (Severity, error) {
	for i, n := range severityNames {
		if n == word {
			return Severity(i), nil
		}
	}
	return Info, fmt.Errorf("%w %q (want info, warning or fail)", ErrUnknownSeverity, word)
}

// Finding is one thing a check found.
type Finding struct {
	Severity Severity `json:"severity"`
	// Code is a stable identifier in snake case ("block_below_roof"), for tests and for tools
	// that read summary.json; the words of Message may change, the code does not.
	Code string `json:"code"`
	// Subject says where: the file and the feature or key, as a person would look it up
	// (`roof.geojson: feature 3 (id "C1")`, `site.yaml: inverter.ac_power_w`). Empty for a
	// finding about the whole survey.
	Subject string `json:"subject,omitempty"`
	// Message says what is wrong, by how much, and what to do.
	Message string `json:"message"`
}

// New returns a Finding with a formatted message.
func New(sev Severity, code, subject, format string, args ...any) Finding {
	return Finding{Severity: sev, Code: code, Subject: subject, Message: fmt.Sprintf(format, args...)}
}

// String returns the finding as one line: severity word, subject, message.
func (f Finding) String() string {
	if f.Subject == "" {
		return f.Severity.String() + " " + f.Message
	}
	return f.Severity.String() + " " + f.Subject + ": " + f.Message
}

// List is the findings of one run.
type List []Finding

// Add appends a finding with a formatted message.
func (l *List) Add(sev Severity, code, subject, format string, args ...any) {
	*l = append(*l, New(sev, code, subject, format, args...))
}

// Sorted returns a copy ordered worst first (fail, warning, info), keeping the order in which
// findings of one severity were found: the order `check` prints them in.
func (l List) Sorted() List {
	out := slices.Clone(l)
	slices.SortStableFunc(out, func(a, b Finding) int { return int(b.Severity) - int(a.Severity) })
	return out
}

// Count returns how many findings have severity s.
func (l List) Count(s Severity) int {
	n := 0
	for _, f := range l {
		if f.Severity == s {
			n++
		}
	}
	return n
}

// Worst returns the highest severity in the list; Info for an empty list.
func (l List) Worst() Severity {
	w := Info
	for _, f := range l {
		w = max(w, f.Severity)
	}
	return w
}

// Err returns nil when nothing fails, else a *FailError holding every Fail finding in order.
func (l List) Err() error {
	var fails List
	for _, f := range l {
		if f.Severity == Fail {
			fails = append(fails, f)
		}
	}
	if len(fails) == 0 {
		return nil
	}
	return &FailError{Findings: fails}
}

// FailError is the error of a list that holds Fail findings. It is bad input: the command
// line maps it to exit status 2.
type FailError struct {
	Findings List
}

// BadInput reports that the user's input is at fault (always true).
func (e *FailError) BadInput() bool { return true }

// Error returns one line per failing finding: subject, then message.
func (e *FailError) Error() string {
	lines := make([]string, len(e.Findings))
	for i, f := range e.Findings {
		if f.Subject == "" {
			lines[i] = f.Message
		} else {
			lines[i] = f.Subject + ": " + f.Message
		}
	}
	return strings.Join(lines, "\n")
}
