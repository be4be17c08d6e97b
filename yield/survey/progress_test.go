package survey_test

import (
	"context"
	"sync"
	"testing"

	"sunstring/yield/survey"
)

// progressLog records, by stage, every (done, total) a Progress callback is told.
type progressLog struct {
	mu     sync.Mutex
	stages map[string][][2]int
	order  []string
}

func (l *progressLog) record(stage string, done, total int) {
	l.mu.Lock()
	defer l.mu.Unlock()
	if l.stages == nil {
		l.stages = map[string][][2]int{}
	}
	if _, ok := l.stages[stage]; !ok {
		l.order = append(l.order, stage)
	}
	l.stages[stage] = append(l.stages[stage], [2]int{done, total})
}

// check reports a stage whose count falls, passes its total or whose total grows, and one
// that does not end at its total; it returns the stage's last total.
func (l *progressLog) check(t *testing.T, stage string) int {
	t.Helper()
	calls := l.stages[stage]
	if len(calls) == 0 {
		t.Errorf("%s: no progress reported (stages: %v)", stage, l.order)
		return 0
	}
	for i, c := range calls {
		if c[0] > c[1] || (i > 0 && (c[0] < calls[i-1][0] || c[1] > calls[i-1][1])) {
			t.Errorf("%s: call %d: %d of %d (before: %v)", stage, i, c[0], c[1], calls[max(i-1, 0)])
		}
	}
	last := calls[len(calls)-1]
	if last[0] != last[1] {
		t.Errorf("%s: ended at %d of %d", stage, last[0], last[1])
	}
	return last[1]
}

// TestSurveyProgress: every long stage of a survey, the layout search and the report files
// included, tells its progress in its own units: never backwards, never beyond its total, and
// ending at it. The layout search counts the layouts it evaluates (a screened one a quarter) and the rendering the files
// it makes (summary.json, modules.geojson, six charts in each format, two documents,
// hourly.csv on request).
func TestSurveyProgress(t *testing.T) {
	p := exampleProject(t)
	p.Cfg.Layouts.Search = true
	var run progressLog
	res, err := p.Run(context.Background(), survey.Options{Progress: run.record})
	if err != nil {
		t.Fatal(err)
	}
	for _, st := range []string{"shading", "module curves", "unshaded reference", survey.AlternativesStage} {
		run.check(t, st)
	}
	// The search counts whole-year evaluations, and screens on every fourth step at a quarter
	// of one each (integer division).
	if got := run.check(t, "layout search"); res.Summary.LayoutAdvice == nil ||
		got != res.Summary.LayoutAdvice.LayoutsEvaluated+res.Summary.LayoutAdvice.LayoutsScreened/4 {
		t.Errorf("layout search: ended at %d; layout advice %+v", got, res.Summary.LayoutAdvice)
	}
	for _, c := range []struct {
		name  string
		opt   survey.RenderOptions
		files int
	}{
		{"PNG charts", survey.RenderOptions{}, 10},
		{"PNG and SVG charts, hourly.csv", survey.RenderOptions{SVG: true, Hourly: true}, 17},
	} {
		t.Run(c.name, func(t *testing.T) {
			var l progressLog
			c.opt.Progress = l.record
			files, err := res.Render(c.opt)
			if err != nil {
				t.Fatal(err)
			}
			got := l.check(t, survey.RenderStage)
			if got != c.files || len(files) != c.files {
				t.Errorf("%d files made, progress counted %d, want %d", len(files), got, c.files)
			}
		})
	}
}
