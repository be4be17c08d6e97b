package cli

import (
	"context"
	"errors"
	"fmt"
	"os"
	"strconv"
	"strings"
	"time"

	"github.com/spf13/cobra"

	"sunstring/yield/report"
	"sunstring/yield/survey"
)

func newSurveyCmd() *cobra.Command {
	var (
		out     string
		svg     bool
		paper   string
		hourly  bool
		timeout time.Duration
	)
	c := &cobra.Command{
		Use:   "survey SITE.yaml -o DIR",
		Short: "Estimate the yield, rank string layouts and write the report",
		Long: `Run the whole survey: place modules on every roof face, compute the sun for every
hour of the year and the shade on every cell of every module, simulate the strings and
the inverter, rank string layouts, and write into DIR:

  summary.json         key figures, losses, layouts and per-module results
  modules.geojson      the placed modules (id, face, string, shade loss) and the drawing
  proposal.pdf         the proposal for the homeowner (A4, or --paper letter)
  technical-sheet.pdf  checks, layouts, alternatives and losses for the installer
  *.png                the charts: plan, strings, sunpath, monthly, losses, layouts
  hourly.csv           with --hourly: weather, sunlit share and AC power per record

DIR is replaced only when the run succeeds; an earlier report stays as it was otherwise.
Estimates only: local codes and a licensed installer have the final word.`,
		Example: "  sunstring survey examples/sample-house/site.yaml -o out",
		Args:    args(cobra.ExactArgs(1)),
	}
	bind := bindSiteFlags(c.Flags())
	f := c.Flags()
	f.StringVarP(&out, "out", "o", "", "output folder (required)")
	f.BoolVar(&svg, "svg", false, "also write the charts as SVG")
	f.StringVar(&paper, "paper", "a4", "proposal paper size: a4 or letter")
	f.BoolVar(&hourly, "hourly", false, "also write hourly.csv (one row per weather record)")
	f.DurationVar(&timeout, "timeout", 0, "give up after this long (e.g. 2m; 0: no limit)")
	c.RunE = func(c *cobra.Command, a []string) (err error) {
		if out == "" {
			return usageError{fmt.Errorf("survey: -o DIR is required: the folder to write the report into")}
		}
		if err := checkPaper(paper); err != nil {
			return err
		}
		if timeout < 0 {
			return usageError{fmt.Errorf("--timeout %s: give a positive duration such as 90s or 5m, or 0 for no limit", timeout)}
		}
		ctx := c.Context()
		if timeout > 0 {
			var cancel func()
			ctx, cancel = contextWithTimeout(ctx, timeout)
			defer cancel()
		}
		defer func() {
			switch {
			case err == nil:
			case errors.Is(ctx.Err(), context.DeadlineExceeded):
				err = fmt.Errorf("survey: gave up after %s (--timeout); nothing was written", timeout)
			case errors.Is(ctx.Err(), context.Canceled):
				err = fmt.Errorf("survey: interrupted; nothing was written")
			}
		}()
		p, err := loadProject(a[0], c.Flags(), bind)
		if err != nil {
			return err
		}
		prog := newProgress(c.ErrOrStderr())
		defer prog.Done()
		res, err := p.Run(ctx, survey.Options{Progress: prog.Update})
		if err != nil {
			return err
		}
		prog.Done()
		sum := res.Summary
		date, err := runDate()
		if err != nil {
			return err
		}
		files, err := res.Render(survey.RenderOptions{SVG: svg, Paper: paper, Hourly: hourly, Date: date, Context: ctx, Progress: prog.Update})
		if err != nil {
			return err
		}
		prog.Done()
		// A run cancelled while rendering or writing writes nothing.
		if err := outputSet(files).commit(ctx, out); err != nil {
			return err
		}
		w := c.OutOrStdout()
		best := sum
		if sum.Climate.Source == "indicative" {
			fmt.Fprintln(w, survey.IndicativeWarning)
		}
		// connected and placed, as the documents count them
		fmt.Fprintf(w, "%s: %s, %.2f kWp", p.Cfg.Name, report.ModulesText(best), best.DCkWp)
		if best.Inverters > 1 {
			fmt.Fprintf(w, " on %d inverters, %s kW AC", best.Inverters, report.Thousands(best.ACkW, 0))
		}
		fmt.Fprintln(w)
		fmt.Fprintf(w, "annual AC energy %s kWh, specific yield %s kWh/kWp, performance ratio %.2f\n",
			report.Thousands(best.AnnualACkWh, 0), report.Thousands(best.SpecificYield, 0), best.PerformanceRatio)
		if len(best.Layouts) > 0 {
			fmt.Fprintf(w, "best layout %q loses %.1f %% to shade\n", best.Layouts[0].Name, best.Layouts[0].ShadeLossPct)
		}
		for _, f := range best.Warnings {
			fmt.Fprintln(c.ErrOrStderr(), f)
		}
		fmt.Fprintln(w, "caution: estimates only; local codes and a licensed installer have the final word on voltages, currents and layouts.")
		fmt.Fprintf(w, "wrote %s\n", out)
		return nil
	}
	return c
}

// checkPaper rejects a paper size the proposal cannot use, before the long simulation runs.
func checkPaper(paper string) error {
	switch strings.ToLower(paper) {
	case "", "a4", "letter":
		return nil
	}
	return usageError{fmt.Errorf("--paper %q: use a4 or letter", paper)}
}

// runDate dates the documents when the site file gives no proposal.date: the day of
// SOURCE_DATE_EPOCH (seconds since 1970, the reproducible-builds convention) when it is
// set, else today's.
func runDate() (time.Time, error) {
	v, ok := os.LookupEnv("SOURCE_DATE_EPOCH")
	if !ok || v == "" {
		return time.Now(), nil
	}
	sec, err := strconv.ParseInt(v, 10, 64)
	if err != nil || sec < 0 {
		return time.Time{}, usageError{fmt.Errorf("SOURCE_DATE_EPOCH %q: give whole seconds since 1970-01-01 UTC", v)}
	}
	return time.Unix(sec, 0).UTC(), nil
}
