package weather

import (
	"fmt"
	"strings"
)

// maxProblems is how many problems an InputError lists before summarizing the rest: enough to
// show a pattern, few enough to read in a terminal.
const maxProblems = 20

// Problem is one thing wrong with user input.
type Problem struct {
	Line  int    // 1-based line in the input; 0 when the input has no lines (monthly values)
	Field string // column or value name, as the user wrote it
	Msg   string // what is wrong and what is allowed
}

// InputError lists every problem found in one input. The CLI maps it, through BadInput, to exit
// status 2.
type InputError struct {
	Name     string    // the input's name for messages, usually the file name
	Problems []Problem // the first maxProblems problems, in input order
	More     int       // how many further problems were found but not kept
}

// BadInput reports that the error is the user's input, not the program.
func (e *InputError) BadInput() bool { return true }

// Error lists the problems one a line as name:line: field "f": message.
func (e *InputError) Error() string {
	var b strings.Builder
	for i, p := range e.Problems {
		if i > 0 {
			b.WriteByte('\n')
		}
		b.WriteString(e.Name)
		if p.Line > 0 {
			fmt.Fprintf(&b, ":%d", p.Line)
		}
		b.WriteString(": ")
		if p.Field != "" {
			fmt.Fprintf(&b, "field %q: ", p.Field)
		}
		b.WriteString(p.Msg)
	}
	if e.More > 0 {
		fmt.Fprintf(&b, "\n%s: and %d more problems", e.Name, e.More)
	}
	return b.String()
}

// problems collects problems for one input; its zero value is ready once name is set.
type problems struct {
	name string
	list []Problem
	more int
}

func (p *problems) add(line int, field, format string, args ...any) {
	if len(p.list) >= maxProblems {
		p.more++
		return
	}
	p.list = append(p.list, Problem{Line: line, Field: field, Msg: fmt.Sprintf(format, args...)})
}

func (p *problems) count() int { return len(p.list) + p.more }

// err returns nil when nothing was found.
func (p *problems) err() error {
	if p.count() == 0 {
		return nil
	}
	return &InputError{Name: p.name, Problems: p.list, More: p.more}
}
