package survey

import (
	"fmt"
	"sunstring/yield/finding"
	"sunstring/yield/report"
)

// Checks gives the string-length window of the module and inverter and the checks of
// every fixed layout; bad is an input error when a fixed layout breaks a limit.
func (p *Project) Checks() (checks []report.Check, bad error, err error) {
	cfg := p.Cfg
	if err := p.prepareLayouts(); err != nil {
		return nil, nil, err
	}
	b := p.bounds
	checks = append(checks, report.Check{Severity: "info", Subject: "strings", Unit: "modules", Value: float64(b.MaxSeries), Limit: float64(b.MinSeries),
		Message: fmt.Sprintf("%d to %d modules per string (open circuit %.2f V a module at %g °C; MPP %.2f V a module at %.0f °C cell); at most %s per input",
			b.MinSeries, b.MaxSeries, b.VocColdV, cfg.Climate.LowTempC, b.VmpHotV, p.hotCellC(), report.Count(b.MaxParallel, "string", "strings"))})
	inv := p.Inverter
	msg := fmt.Sprintf("one inverter of %s W AC with %s", report.Thousands(inv.ACPowerW, 0), report.Count(inv.Inputs, "input", "inputs"))
	if n := p.Inverters(); n > 1 {
		msg = fmt.Sprintf("%d inverters of %s W AC each (%s W together), %s each: the strings share %d inputs, and each inverter clips at its own AC power",
			n, report.Thousands(inv.ACPowerW, 0), report.Thousands(float64(n)*inv.ACPowerW, 0), report.Count(inv.Inputs, "input", "inputs"), p.inputs())
	}
	checks = append(checks, report.Check{Severity: "info", Subject: "inverters", Unit: "W", Value: float64(p.Inverters()) * inv.ACPowerW, Limit: inv.ACPowerW, Message: msg})
	// The roof-order layout's strings, which a survey always reports.
	seq, _, err := p.roofOrder()
	if err != nil {
		return nil, nil, err
	}
	seq = p.Plant().Deal(seq) // as the survey wires it
	connected := 0
	for _, ls := range lengths(seq) {
		for _, n := range ls {
			connected += n
		}
	}
	if connected < len(p.Modules) {
		checks = append(checks, report.Check{Severity: "warning", Subject: "inverter", Unit: "modules", Value: float64(len(p.Modules)), Limit: float64(connected),
			Message: fmt.Sprintf("the inverter takes at most %d of the %d placed modules (%s × %s × %s); the rest stay unconnected unless the inverter or inverter.count changes",
				connected, len(p.Modules), p.inputsText(), report.Count(b.MaxParallel, "string", "strings"), report.Count(b.MaxSeries, "module", "modules"))})
	}
	checks = append(checks, p.electricalChecks(roofOrderName, lengths(seq))...)
	for i, fl := range cfg.Layouts.Fixed {
		cs := p.electricalChecks(fl.Name, lengths(p.fixed[i]))
		for _, c := range cs {
			if c.Severity == finding.Fail.String() && bad == nil {
				bad = badInput{fmt.Errorf("%s: layouts.fixed[%d] (%q): %s", cfg.File, i, fl.Name, c.Message)}
			}
		}
		checks = append(checks, cs...)
	}
	checks = append(checks, p.leakageChecks(seq)...)
	return checks, bad, nil
}
