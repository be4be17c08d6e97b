package cli

import (
	"encoding/json"
	"fmt"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"sunstring/geo"
	"sunstring/yield/report"
)

func newCheckCmd() *cobra.Command {
	var asJSON bool
	c := &cobra.Command{
		Use:   "check SITE.yaml",
		Short: "Validate the site file and the map, and print a site summary",
		Long: `Validate the site file and the map it names, place the modules, and print each
roof face (plan and sloped area, pitch, aspect, modules, kWp), the total, the placed
modules' ids by face and row (<face>.<row>.<column>, row 1 at the eave; the ids the sky
command, the fixed layouts and the report use), and every warning. Exit status 2 when
something is wrong, with one message per problem.`,
		Args: args(cobra.ExactArgs(1)),
	}
	bind := bindSiteFlags(c.Flags())
	c.Flags().BoolVar(&asJSON, "json", false, "print the summary as JSON")
	c.RunE = func(c *cobra.Command, a []string) error {
		p, err := loadProject(a[0], c.Flags(), bind)
		if err != nil {
			return err
		}
		faces := geo.Summarize(p.Site, p.Modules)
		var elec []report.Check
		var bad error
		if len(p.Modules) == 0 {
			bad = p.NoModules() // the face table still helps to see why
		} else if elec, bad, err = p.Checks(); err != nil {
			return err
		}
		kw := p.Datasheet.PowerW / 1000
		warnings := append(append([]string{}, p.Site.Warnings...), p.Notes...)
		w := c.OutOrStdout()
		if asJSON {
			out := struct {
				Name     string         `json:"name"`
				Faces    []report.Face  `json:"faces"`
				Modules  int            `json:"modules"`
				KWp      float64        `json:"dc_kwp"`
				Warnings []string       `json:"warnings"`
				Checks   []report.Check `json:"checks"`
				Cautions []string       `json:"cautions"`
				// ModuleIDs are the placed modules, in the fill's order.
				ModuleIDs []string `json:"module_ids"`
			}{Name: p.Cfg.Name, Modules: len(p.Modules), KWp: float64(len(p.Modules)) * kw, Warnings: warnings,
				Checks: elec, Cautions: report.Cautions, ModuleIDs: []string{}}
			for _, m := range p.Modules {
				out.ModuleIDs = append(out.ModuleIDs, m.ID)
			}
			for _, f := range p.Faces() {
				// Rounded as summary.json rounds them.
				f.PlanAreaM2, f.SlopedAreaM2 = report.Round(f.PlanAreaM2, 2), report.Round(f.SlopedAreaM2, 2)
				f.PitchDeg, f.AspectDeg, f.KWp = report.Round(f.PitchDeg, 1), report.Round(f.AspectDeg, 1), report.Round(f.KWp, 3)
				out.Faces = append(out.Faces, f)
			}
			out.KWp = report.Round(out.KWp, 3)
			if out.Warnings == nil {
				out.Warnings = []string{}
			}
			enc := json.NewEncoder(w)
			enc.SetIndent("", "  ")
			if err := enc.Encode(out); err != nil {
				return err
			}
			return bad
		}
		fmt.Fprintf(w, "%s — %.5f, %.5f (%s)\n\n", p.Cfg.Name, p.LatDeg, p.LonDeg, p.Cfg.Timezone)
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "face\tplan m²\tsloped m²\tpitch °\taspect °\tmodules\tkWp\t")
		for _, f := range faces {
			fmt.Fprintf(tw, "%s\t%.1f\t%.1f\t%.1f\t%.0f\t%d\t%.2f\t\n", f.ID, f.PlanAreaM2, f.SlopedAreaM2, f.PitchDeg, f.AspectDeg, f.Modules, float64(f.Modules)*kw)
		}
		fmt.Fprintf(tw, "total\t\t\t\t\t%d\t%.2f\t\n", len(p.Modules), float64(len(p.Modules))*kw)
		tw.Flush()
		if len(p.Modules) > 0 {
			fmt.Fprintln(w, "\nmodule ids (<face>.<row>.<column>; row 1 at the eave, column 1 at the left seen from below):")
			for _, line := range moduleIDLines(p.Modules) {
				fmt.Fprintln(w, "  "+line)
			}
		}
		for _, s := range warnings {
			fmt.Fprintln(w, "warning:", s)
		}
		fmt.Fprintln(w)
		for _, ck := range elec {
			fmt.Fprintf(w, "%-7s %s: %s\n", ck.Severity, ck.Subject, ck.Message)
		}
		fmt.Fprintln(w)
		for _, ct := range report.Cautions {
			fmt.Fprintln(w, "caution:", ct)
		}
		return bad
	}
	return c
}

// moduleIDLines lists the modules' ids, one line per face and row, in the fill's order.
func moduleIDLines(ms []geo.Module) []string {
	var lines []string
	for i := 0; i < len(ms); {
		j := i
		var ids []string
		for ; j < len(ms) && ms[j].Face == ms[i].Face && ms[j].Row == ms[i].Row; j++ {
			ids = append(ids, ms[j].ID)
		}
		where := fmt.Sprintf("%s row %d", ms[i].Face, ms[i].Row)
		if ms[i].Row == 0 {
			where = ms[i].Face + ", drawn by hand"
		}
		lines = append(lines, where+": "+strings.Join(ids, " "))
		i = j
	}
	return lines
}
