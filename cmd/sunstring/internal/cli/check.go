package cli

import (
	"encoding/json"
	"fmt"
	"strings"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"sunstring/geo"
	"sunstring/yield/finding"
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
		pf, err := p.Preflight()
		if err != nil {
			return err
		}
		var elec []report.Check
		var bad error
		if len(p.Modules) == 0 {
			bad = p.NoModules() // the face table still helps to see why
		} else if elec, bad, err = p.Checks(); err != nil {
			return err
		}
		if err := pf.Findings.Err(); err != nil {
			bad = err // a plausibility fail: the survey would refuse it too
		}
		// Every line worst first: what fails, then what to look at, then the record.
		lines := checkLines(pf.Findings, elec)
		kw := p.Datasheet.PowerW / 1000
		w := c.OutOrStdout()
		if asJSON {
			out := struct {
				Name     string            `json:"name"`
				Faces    []report.Face     `json:"faces"`
				Modules  int               `json:"modules"`
				KWp      float64           `json:"dc_kwp"`
				Warnings []finding.Finding `json:"warnings"`
				Notes    []finding.Finding `json:"notes"`
				Checks   []report.Check    `json:"checks"`
				Cautions []string          `json:"cautions"`
				// ModuleIDs are the placed modules, in the fill's order.
				ModuleIDs []string `json:"module_ids"`
			}{Name: p.Cfg.Name, Modules: len(p.Modules), KWp: float64(len(p.Modules)) * kw,
				Warnings: []finding.Finding{}, Notes: []finding.Finding{}, Checks: elec, Cautions: report.Cautions, ModuleIDs: []string{}}
			for _, m := range p.Modules {
				out.ModuleIDs = append(out.ModuleIDs, m.ID)
			}
			for _, f := range pf.Findings.Sorted() {
				if f.Severity == finding.Info {
					out.Notes = append(out.Notes, f)
				} else {
					out.Warnings = append(out.Warnings, f)
				}
			}
			for i, f := range p.Faces() {
				f.AnnualPOAkWhM2 = pf.FaceKWhM2[i]
				// Rounded as summary.json rounds them.
				f.PlanAreaM2, f.SlopedAreaM2 = report.Round(f.PlanAreaM2, 2), report.Round(f.SlopedAreaM2, 2)
				f.PitchDeg, f.AspectDeg, f.KWp = report.Round(f.PitchDeg, 1), report.Round(f.AspectDeg, 1), report.Round(f.KWp, 3)
				f.AnnualPOAkWhM2 = report.Round(f.AnnualPOAkWhM2, 1)
				out.Faces = append(out.Faces, f)
			}
			out.KWp = report.Round(out.KWp, 3)
			enc := json.NewEncoder(w)
			enc.SetIndent("", "  ")
			if err := enc.Encode(out); err != nil {
				return err
			}
			return bad
		}
		fmt.Fprintf(w, "%s — %.5f, %.5f (%s)\n\n", p.Cfg.Name, p.LatDeg, p.LonDeg, p.Cfg.Timezone)
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "face\tplan m²\tsloped m²\tpitch °\taspect °\tkWh/m² a year\tmodules\tkWp\t")
		for i, f := range p.Faces() {
			fmt.Fprintf(tw, "%s\t%.1f\t%.1f\t%.1f\t%.0f\t%.0f\t%d\t%.2f\t\n", f.ID, f.PlanAreaM2, f.SlopedAreaM2, f.PitchDeg, f.AspectDeg, pf.FaceKWhM2[i], f.Modules, f.KWp)
		}
		fmt.Fprintf(tw, "total\t\t\t\t\t\t%d\t%.2f\t\n", len(p.Modules), float64(len(p.Modules))*kw)
		tw.Flush()
		fmt.Fprintln(w, "(kWh/m² a year: each face's irradiation without shade, from the climate the survey uses)")
		if len(p.Modules) > 0 {
			fmt.Fprintln(w, "\nmodule ids (<face>.<row>.<column>; row 1 at the eave, column 1 at the left seen from below):")
			for _, line := range moduleIDLines(p.Modules) {
				fmt.Fprintln(w, "  "+line)
			}
		}
		fmt.Fprintln(w)
		for _, l := range lines {
			fmt.Fprintln(w, l)
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

// checkLines returns check's lines worst first, each starting with its severity: the
// findings and the electrical checks merged, the order within a severity kept.
func checkLines(fs finding.List, elec []report.Check) []string {
	all := append(finding.List(nil), fs...)
	for _, ck := range elec {
		sev, err := finding.ParseSeverity(ck.Severity)
		if err != nil {
			sev = finding.Warning
		}
		all = append(all, finding.Finding{Severity: sev, Subject: ck.Subject, Message: ck.Message})
	}
	var out []string
	for _, f := range all.Sorted() {
		out = append(out, f.String())
	}
	return out
}
