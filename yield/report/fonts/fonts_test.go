package fonts

import "testing"

// Each script of the chain is drawn by the face meant for it, and no face claims a
// character it lacks (the private-use U+E000 is in none of them).
func TestCoverage(t *testing.T) {
	cases := []struct {
		name string
		face *Face
		text string
	}{
		{"Greek", chain[0], "Ωμέγα"},
		{"Arabic", chain[0], "بيت"},
		{"Hebrew", chain[0], "בית"},
		{"Devanagari", chain[1], "घर"},
		{"Thai", chain[2], "บ้าน"},
		{"Chinese", chain[3], "山田邸"},
		{"Japanese kana", chain[3], "ひらがなカタカナ"},
		{"Korean", chain[3], "한글"},
		{"emoji", picto, "🏠😀👍☀"},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			for _, r := range tc.text {
				if !tc.face.Has(r) {
					t.Errorf("%s lacks %q (U+%04X)", tc.face.Name, r, r)
				}
			}
		})
	}
	for _, f := range append(Chain(), Pictographs()) {
		if f.Has(0xe000) {
			t.Errorf("%s claims the private-use U+E000", f.Name)
		}
	}
}
