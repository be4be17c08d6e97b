package survey

import (
	"fmt"
	"strings"

	"sunstring/yield/electric"
	"sunstring/yield/finding"
	"sunstring/yield/irradiance"
	"sunstring/yield/report"
)

// Mounting returns the validated module.mounting (the default, rails, when unset).
func (p *Project) Mounting() irradiance.Mounting {
	m, _ := irradiance.ParseMounting(strings.ToLower(p.Cfg.Module.Mounting))
	return m
}

// hotCellC is the hottest expected cell temperature: a cell in full sun at the hottest air
// with a light wind, by the mounting's own temperature model (the one the yield uses).
func (p *Project) hotCellC() float64 { return p.Mounting().HotCellC(p.Cfg.Climate.HighTempC) }

// electricalChecks gives, for a layout's string lengths per inverter input, the numbers a
// surveyor must see (open-circuit voltage at the coldest, MPP voltage at the hottest, input
// current) and every limit broken, each in volts or amperes.
//
// lens are the plant's inputs in order, inverter by inverter (electric.Plant.Split): with
// several inverters each is checked against its own limits and named in the subject.
func (p *Project) electricalChecks(name string, lens [][]int) []report.Check {
	per := p.Inverter.Inputs
	if p.Inverters() == 1 || len(lens) <= per {
		subject := name
		if p.Inverters() > 1 {
			subject += ", inverter 1"
		}
		return p.inverterChecks(subject, lens)
	}
	var out []report.Check
	for k := 0; k*per < len(lens); k++ {
		out = append(out, p.inverterChecks(fmt.Sprintf("%s, inverter %d", name, k+1), lens[k*per:min((k+1)*per, len(lens))])...)
	}
	return out
}

// inverterChecks is electricalChecks for one inverter's inputs.
func (p *Project) inverterChecks(name string, lens [][]int) []report.Check {
	ds, inv := p.Datasheet, p.Inverter
	low, hot := p.Cfg.Climate.LowTempC, p.hotCellC()
	var out []report.Check
	for a, ls := range lens {
		if len(ls) == 0 {
			continue
		}
		longest, shortest := ls[0], ls[0]
		for _, n := range ls {
			longest, shortest = max(longest, n), min(shortest, n)
		}
		subj := fmt.Sprintf("%s, input %d", name, a+1)
		voc := float64(longest) * electric.VocAt(ds, low)
		out = append(out, report.Check{Severity: "info", Subject: subj, Unit: "V", Value: voc, Limit: inv.MaxDCVoltageV,
			Message: fmt.Sprintf("%s in series: %.1f V open circuit at %g °C (inverter maximum %.0f V)", report.Count(longest, "module", "modules"), voc, low, inv.MaxDCVoltageV)})
		if ms := p.Cfg.Module.MaxSystemVoltage; ms > 0 && voc > ms {
			out = append(out, report.Check{Severity: finding.Fail.String(), Subject: subj, Unit: "V", Value: voc, Limit: ms,
				Message: fmt.Sprintf("%s reach %.1f V open circuit at %g °C, above the module's maximum system voltage %.0f V", report.Count(longest, "module", "modules"), voc, low, ms)})
		}
		vmp := float64(shortest) * electric.VmpAt(ds, hot)
		out = append(out, report.Check{Severity: "info", Subject: subj, Unit: "V", Value: vmp, Limit: inv.MPPTMinV,
			Message: fmt.Sprintf("%s in series: %.1f V at the maximum power point at %.0f °C cell (MPPT minimum %.0f V)", report.Count(shortest, "module", "modules"), vmp, hot, inv.MPPTMinV)})
		cur := float64(len(ls)) * ds.ImpA
		out = append(out, report.Check{Severity: "info", Subject: subj, Unit: "A", Value: cur, Limit: inv.MaxInputCurrentA,
			Message: fmt.Sprintf("%s: %.1f A at the maximum power point (input limit %.1f A)", parallel(len(ls)), cur, inv.MaxInputCurrentA)})
	}
	for _, f := range electric.CheckStrings(ds, lens, low, hot, inv) {
		out = append(out, fromFinding(name, f))
	}
	return out
}

// leakageChecks is the capacitive leakage estimate for a transformerless inverter, over the
// modules a layout (its inputs the plant's, in order) connects: with several inverters, each
// inverter's own modules against its own residual-current monitoring.
func (p *Project) leakageChecks(l electric.Layout) []report.Check {
	var out []report.Check
	inv := p.Inverter
	if !p.Cfg.Inverter.Transformerless || len(p.Modules) == 0 {
		return out
	}
	on := make([]int, p.Inverters())
	plant := p.Plant()
	for a, in := range l.Inputs {
		k, _ := plant.Locate(a)
		for _, s := range in {
			on[k] += len(s)
		}
	}
	for k, connected := range on {
		if connected == 0 {
			continue
		}
		subject := "array"
		if len(on) > 1 {
			subject = fmt.Sprintf("inverter %d", k+1)
		}
		area := float64(connected) * p.Modules[0].AreaM2()
		if lr, err := electric.Leakage(area, electric.LeakageAssumptions{RatedKVA: inv.ACPowerW / 1000}); err == nil {
			out = append(out, report.Check{Severity: "info", Subject: subject, Unit: "mA", Value: lr.WetmA, Limit: lr.ContinuousLimitmA,
				Message: fmt.Sprintf("capacitive leakage with a transformerless inverter: about %.0f mA dry, %.0f mA wet (%.0f / %.0f nF to earth; assumed 20 / 100 nF per m² of module and 115 V common-mode at 50 Hz)",
					lr.DrymA, lr.WetmA, lr.CapDryNF, lr.CapWetNF)})
			for _, f := range lr.Findings {
				out = append(out, fromFinding(subject, f))
			}
		}
	}
	return out
}

func fromFinding(subject string, f electric.Finding) report.Check {
	sev := "info"
	switch f.Severity {
	case electric.Error:
		sev = finding.Fail.String()
	case electric.Warning:
		sev = "warning"
	}
	msg := f.Message
	if f.Input >= 0 && subject != "array" && !strings.HasPrefix(subject, "inverter ") {
		subject = fmt.Sprintf("%s, input %d", subject, f.Input+1)
		msg = strings.TrimPrefix(msg, fmt.Sprintf("input %d: ", f.Input+1))
	}
	return report.Check{Severity: sev, Subject: subject, Message: msg, Value: f.Value, Limit: f.Limit, Unit: f.Unit, Detail: f.Detail}
}

// parallel names an input's strings: "1 string", "2 strings in parallel".
func parallel(n int) string {
	if n == 1 {
		return "1 string"
	}
	return fmt.Sprintf("%d strings in parallel", n)
}

// lengths returns the string lengths per input of a layout.
func lengths(l electric.Layout) [][]int {
	out := make([][]int, len(l.Inputs))
	for a, in := range l.Inputs {
		for _, s := range in {
			out[a] = append(out[a], len(s))
		}
	}
	return out
}

// countInputs returns how many inputs of a layout have strings.
func countInputs(l electric.Layout) int {
	n := 0
	for _, in := range l.Inputs {
		if len(in) > 0 {
			n++
		}
	}
	return n
}
