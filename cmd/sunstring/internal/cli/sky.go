package cli

import (
	"fmt"
	"os"
	"path/filepath"
	"strings"

	"github.com/google/renameio/v2"
	"github.com/spf13/cobra"
	"gonum.org/v1/plot/vg"

	"sunstring/yield/report"
)

func newSkyCmd() *cobra.Command {
	var module, out string
	c := &cobra.Command{
		Use:   "sky SITE.yaml --module ID -o FILE.png",
		Short: "Draw the sun path and the obstructions seen from one module",
		Long: `Draw a sun-path chart for one module: the sun's elevation against its azimuth on the
21st of each month, with hour lines in local standard time, and the silhouette of every
roof face, block, tree and the far horizon as seen from the module's centre. Where a
day's path runs through a silhouette, the module is in shade at that time of year.

The file's extension chooses the format: .png or .svg.`,
		Example: "  sunstring sky examples/sample-house/site.yaml --module G.1.1 -o sky-G.1.1.png",
		Args:    args(cobra.ExactArgs(1)),
	}
	bind := bindSiteFlags(c.Flags())
	c.Flags().StringVar(&module, "module", "", "module id, <face>.<row>.<column> (see 'sunstring check')")
	c.Flags().StringVarP(&out, "out", "o", "", "chart file to write (.png or .svg)")
	c.RunE = func(c *cobra.Command, a []string) error {
		var probs []string
		if module == "" {
			probs = append(probs, "--module: give a module id such as S.1.1 (the ids are listed by 'sunstring check' and in modules.geojson)")
		}
		format := report.PNG
		switch strings.ToLower(filepath.Ext(out)) {
		case ".png":
		case ".svg":
			format = report.SVG
		default:
			probs = append(probs, "-o: give a file ending in .png or .svg")
		}
		if d := filepath.Dir(out); out != "" {
			if st, err := os.Stat(d); err != nil || !st.IsDir() {
				probs = append(probs, fmt.Sprintf("-o %s: the folder %s does not exist", out, d))
			}
		}
		if len(probs) > 0 {
			return usageError{joinLines(probs)}
		}
		p, err := loadProject(a[0], c.Flags(), bind)
		if err != nil {
			return err
		}
		sp, err := p.SkyView(module)
		if err != nil {
			return fmt.Errorf("--module: %w", err)
		}
		b, err := report.Render(report.SunPathChart(sp), 18*vg.Centimeter, 11*vg.Centimeter, format)
		if err != nil {
			return err
		}
		if err := renameio.WriteFile(out, b, 0o644); err != nil {
			return fmt.Errorf("sky: %w", err)
		}
		fmt.Fprintf(c.OutOrStdout(), "wrote %s (sun path and obstructions seen from %s)\n", out, module)
		return nil
	}
	return c
}
