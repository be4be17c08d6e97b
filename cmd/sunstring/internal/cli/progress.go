package cli

import (
	"fmt"
	"io"
	"os"
	"sync"

	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"
)

// progress shows long stages as a bar on a terminal's standard error, and nothing when
// standard error is not a terminal (a pipe, a log file, CI). A finished stage keeps its line
// with its full count and time, so the bar never vanishes short of its end; a stage left
// before its end (an error, a timeout) keeps the line as it last stood.
type progress struct {
	mu    sync.Mutex
	w     io.Writer
	on    bool
	bar   *progressbar.ProgressBar
	stage string
}

func newProgress(w io.Writer) *progress {
	f, ok := w.(*os.File)
	return &progress{w: w, on: ok && term.IsTerminal(int(f.Fd()))}
}

// Update reports that done of total units of stage are finished. A stage's total may change
// as it goes (the layout search gives back the budget a level did not need): the bar then
// counts against the new total. Safe for concurrent use.
func (p *progress) Update(stage string, done, total int) {
	if !p.on {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.bar == nil || p.stage != stage {
		p.end()
		p.stage = stage
		p.bar = progressbar.NewOptions(total,
			progressbar.OptionSetWriter(p.w),
			progressbar.OptionSetDescription(stage),
			progressbar.OptionShowCount(),
			progressbar.OptionOnCompletion(func() { fmt.Fprintln(p.w) }),
			progressbar.OptionThrottle(100_000_000),
		)
		p.bar.RenderBlank() // show the stage at once, not after the first throttle interval
	}
	if int64(total) != p.bar.GetMax64() {
		p.bar.ChangeMax(total)
	}
	p.bar.Set(done)
}

// Done ends the current stage's line.
func (p *progress) Done() {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.end()
}

// end closes the current bar: a finished one has ended its line already, one short of its
// end stops where it stands (Exit ends the line).
func (p *progress) end() {
	if p.bar != nil && !p.bar.IsFinished() {
		p.bar.Exit()
	}
	p.bar = nil
}
