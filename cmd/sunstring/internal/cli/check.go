package cli

import (
	"encoding/json"
	"fmt"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"sunstring/geo"
)

func newCheckCmd() *cobra.Command {
	var asJSON bool
	c := &cobra.Command{
		Use:   "check SITE.yaml",
		Short: "Validate the site file and the map, and print a site summary",
		Long: `Validate the site file and the map it names, place the modules, and print each
roof face (plan and sloped area, pitch, aspect, modules, kWp), the total, and every
warning. Exit status 2 when something is wrong, with one message per problem.`,
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
		kw := p.Datasheet.PowerW / 1000
		warnings := append(append([]string{}, p.Site.Warnings...), p.Notes...)
		w := c.OutOrStdout()
		if asJSON {
			type face struct {
				geo.FaceSummary
				KWp float64 `json:"kwp"`
			}
			out := struct {
				Name     string   `json:"name"`
				Faces    []face   `json:"faces"`
				Modules  int      `json:"modules"`
				KWp      float64  `json:"dc_kwp"`
				Warnings []string `json:"warnings"`
			}{Name: p.Cfg.Name, Modules: len(p.Modules), KWp: float64(len(p.Modules)) * kw, Warnings: warnings}
			for _, f := range faces {
				out.Faces = append(out.Faces, face{f, float64(f.Modules) * kw})
			}
			if out.Warnings == nil {
				out.Warnings = []string{}
			}
			enc := json.NewEncoder(w)
			enc.SetIndent("", "  ")
			return enc.Encode(out)
		}
		fmt.Fprintf(w, "%s — %.5f, %.5f (%s)\n\n", p.Cfg.Name, p.LatDeg, p.LonDeg, p.Cfg.Timezone)
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "face\tplan m²\tsloped m²\tpitch °\taspect °\tmodules\tkWp\t")
		for _, f := range faces {
			fmt.Fprintf(tw, "%s\t%.1f\t%.1f\t%.1f\t%.0f\t%d\t%.2f\t\n", f.ID, f.PlanAreaM2, f.SlopedAreaM2, f.PitchDeg, f.AspectDeg, f.Modules, float64(f.Modules)*kw)
		}
		fmt.Fprintf(tw, "total\t\t\t\t\t%d\t%.2f\t\n", len(p.Modules), float64(len(p.Modules))*kw)
		tw.Flush()
		for _, s := range warnings {
			fmt.Fprintln(w, "warning:", s)
		}
		return nil
	}
	return c
}
