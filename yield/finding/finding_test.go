package finding_test

import (
	"encoding/json"
	"errors"
	"fmt"
	"strings"
	"testing"

	"sunstring/yield/finding"
)

func TestSeverityText(t *testing.T) {
	tests := []struct {
		name string
		sev  finding.Severity
		word string
	}{
		{"info is the zero value", finding.Severity(0), "info"},
		{"warning", finding.Warning, "warning"},
		{"fail", finding.Fail, "fail"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			b, err := tc.sev.MarshalText()
			if err != nil || string(b) != tc.word {
				t.Fatalf("MarshalText = %q, %v; want %q", b, err, tc.word)
			}
			var back finding.Severity
			if err := back.UnmarshalText(b); err != nil || back != tc.sev {
				t.Fatalf("UnmarshalText(%q) = %v, %v; want %v", b, back, err, tc.sev)
			}
		})
	}
	if _, err := finding.ParseSeverity("error"); !errors.Is(err, finding.ErrUnknownSeverity) {
		t.Errorf("ParseSeverity(error) = %v, want ErrUnknownSeverity", err)
	}
	if _, err := finding.Severity(7).MarshalText(); err == nil {
		t.Error("MarshalText of an undefined severity succeeded")
	}
}

func TestListSortedAndErr(t *testing.T) {
	var l finding.List
	l.Add(finding.Info, "a", "", "first info")
	l.Add(finding.Warning, "b", "site.yaml: x", "first warning")
	l.Add(finding.Info, "c", "", "second info")
	l.Add(finding.Fail, "d", "m.geojson: feature 2", "a fail")
	l.Add(finding.Warning, "e", "", "second warning")

	var got []string
	for _, f := range l.Sorted() {
		got = append(got, f.Code)
	}
	if want := "d b e a c"; strings.Join(got, " ") != want {
		t.Errorf("Sorted codes %q, want %q (worst first, stable within a severity)", strings.Join(got, " "), want)
	}
	if l[0].Code != "a" {
		t.Error("Sorted changed the list it was called on")
	}
	if l.Count(finding.Warning) != 2 || l.Worst() != finding.Fail {
		t.Errorf("Count(warning) %d, Worst %v; want 2, fail", l.Count(finding.Warning), l.Worst())
	}
	err := l.Err()
	var bad interface{ BadInput() bool }
	if !errors.As(err, &bad) || !bad.BadInput() {
		t.Fatalf("Err() = %v, want a bad-input error", err)
	}
	if err.Error() != "m.geojson: feature 2: a fail" {
		t.Errorf("Err().Error() = %q", err.Error())
	}
	if (finding.List{{Severity: finding.Warning}}).Err() != nil {
		t.Error("a list without a fail has an error")
	}
}

func TestFindingJSON(t *testing.T) {
	f := finding.New(finding.Warning, "dc_ac_ratio", "site.yaml: inverter.ac_power_w", "ratio %.1f", 3.0)
	b, err := json.Marshal(f)
	if err != nil {
		t.Fatal(err)
	}
	want := `{"severity":"warning","code":"dc_ac_ratio","subject":"site.yaml: inverter.ac_power_w","message":"ratio 3.0"}`
	if string(b) != want {
		t.Errorf("JSON %s\nwant %s", b, want)
	}
	var back finding.Finding
	if err := json.Unmarshal(b, &back); err != nil || back != f {
		t.Errorf("round trip %+v, %v", back, err)
	}
}

func ExampleList_Sorted() {
	var l finding.List
	l.Add(finding.Info, "overlap_trimmed", `roof.geojson: feature 1 (id "N")`, "2 cm overlap with face \"S\" trimmed")
	l.Add(finding.Warning, "dc_ac_ratio", "site.yaml: inverter.ac_power_w", "DC/AC ratio 3.0 is above 1.5; choose a larger inverter")
	for _, f := range l.Sorted() {
		fmt.Println(f)
	}
	// Output:
	// warning site.yaml: inverter.ac_power_w: DC/AC ratio 3.0 is above 1.5; choose a larger inverter
	// info roof.geojson: feature 1 (id "N"): 2 cm overlap with face "S" trimmed
}
