package cli

import (
	"io"
	"os"
	"sync"

	"github.com/schollz/progressbar/v3"
	"golang.org/x/term"
)

// progress shows long stages as a bar on a terminal's standard error, and nothing when
// standard error is not a terminal (a pipe, a log file, CI).
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

// Update reports that done of total units of stage are finished. Safe for concurrent use.
func (p *progress) Update(stage string, done, total int) {
	if !p.on {
		return
	}
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.bar == nil || p.stage != stage {
		if p.bar != nil {
			p.bar.Finish()
		}
		p.stage = stage
		p.bar = progressbar.NewOptions(total,
			progressbar.OptionSetWriter(p.w),
			progressbar.OptionSetDescription(stage),
			progressbar.OptionShowCount(),
			progressbar.OptionClearOnFinish(),
			progressbar.OptionThrottle(100_000_000),
		)
		p.bar.RenderBlank() // show the stage at once, not after the first throttle interval
	}
	p.bar.Set(done)
}

// Done clears the bar.
func (p *progress) Done() {
	p.mu.Lock()
	defer p.mu.Unlock()
	if p.bar != nil {
		p.bar.Finish()
		p.bar = nil
	}
}
