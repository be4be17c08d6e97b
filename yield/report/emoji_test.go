package report

import (
	"bytes"
	"testing"
)

func TestProposalWithEmojiName(t *testing.T) {
	pr := fixture("file")
	pr.Summary.Site.Name = "Haus Sonnenschein ☀️ 🏠 — 日当たり"
	pr.Summary.Faces[0].ID = "Süd 🌞"
	pr.Summary.Overrides = []Override{{Key: "inverter.ac_power_w", Value: "7000", Source: "environment variable SUNSTRING_INVERTER_AC_POWER_W"}}
	for _, render := range []func() ([]byte, error){pr.PDF, pr.TechnicalPDF} {
		b, err := render()
		if err != nil {
			t.Fatalf("PDF with emoji in the name: %v", err)
		}
		if !bytes.HasPrefix(b, []byte("%PDF")) {
			t.Error("not a PDF")
		}
	}
	if pr.Summary.Site.Name != "Haus Sonnenschein ☀️ 🏠 — 日当たり" {
		t.Errorf("the summary's name was changed to %q", pr.Summary.Site.Name)
	}
}
