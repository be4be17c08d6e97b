package cli

import (
	"encoding/csv"
	"fmt"
	"strconv"
	"text/tabwriter"

	"github.com/spf13/cobra"

	"sunstring/yield/report"
	"sunstring/yield/survey"
)

func newClimateCmd() *cobra.Command {
	var asCSV bool
	c := &cobra.Command{
		Use:   "climate SITE.yaml",
		Short: "Print the monthly climate the survey would use",
		Long: `Print the monthly table of the climate a survey of SITE.yaml uses: global
horizontal (GHI), direct normal (DNI) and diffuse horizontal (DHI) irradiation in kWh/m²
and the mean air temperature, with where they come from (a weather file, the site
file's monthly values turned into an hourly year, or an indicative clear-sky year).`,
		Args: args(cobra.ExactArgs(1)),
	}
	bind := bindSiteFlags(c.Flags())
	c.Flags().BoolVar(&asCSV, "csv", false, "print CSV (month,ghi_kwh_m2,dni_kwh_m2,dhi_kwh_m2,air_temp_c,source)")
	c.RunE = func(c *cobra.Command, a []string) error {
		p, err := loadProject(a[0], c.Flags(), bind)
		if err != nil {
			return err
		}
		ws, err := p.Weather()
		if err != nil {
			return err
		}
		ms := ws.Monthly()
		w := c.OutOrStdout()
		if asCSV {
			cw := csv.NewWriter(w)
			cw.Write([]string{"month", "ghi_kwh_m2", "dni_kwh_m2", "dhi_kwh_m2", "air_temp_c", "source"})
			f := func(x float64) string { return strconv.FormatFloat(report.Round(x, 2), 'f', -1, 64) }
			for i, m := range ms {
				cw.Write([]string{strconv.Itoa(i + 1), f(m.GHIKWhM2), f(m.DNIKWhM2), f(m.DHIKWhM2), f(m.TempC), string(ws.Source)})
			}
			cw.Flush()
			return cw.Error()
		}
		fmt.Fprintf(w, "climate source: %s\n", ws.Source)
		if ws.Source == "indicative" {
			fmt.Fprintln(w, survey.IndicativeWarning)
		}
		tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
		fmt.Fprintln(tw, "month\tGHI kWh/m²\tDNI kWh/m²\tDHI kWh/m²\tair °C\t")
		var g, d, h float64
		for i, m := range ms {
			fmt.Fprintf(tw, "%s\t%.1f\t%.1f\t%.1f\t%.1f\t\n", report.MonthNames[i], m.GHIKWhM2, m.DNIKWhM2, m.DHIKWhM2, m.TempC)
			g, d, h = g+m.GHIKWhM2, d+m.DNIKWhM2, h+m.DHIKWhM2
		}
		fmt.Fprintf(tw, "year\t%.0f\t%.0f\t%.0f\t\t\n", g, d, h)
		tw.Flush()
		for _, s := range ws.Warnings {
			fmt.Fprintln(w, "warning", s) // the severity first, as check prints it
		}
		return nil
	}
	return c
}
