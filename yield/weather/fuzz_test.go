package weather

import (
	"bytes"
	"os"
	"testing"
)

func addSeeds(f *testing.F, files ...string) {
	for _, name := range files {
		b, err := os.ReadFile("testdata/" + name)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
}

func FuzzReadEPW(f *testing.F) {
	addSeeds(f, "sample.epw")
	f.Add([]byte(epwDoc(epwDays(2024, 2, 28, 2))))
	f.Add([]byte(epwHeader + "2019,1,1,1,60,x,99.9,0,0,0,0,0,0,0,9999,9999,0,0,0,0,0,999,0,0,0,0,0,0,0,0,0,0,0,0,0\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := ReadEPW(bytes.NewReader(data), "fuzz.epw")
		if err != nil {
			if s != nil {
				t.Fatalf("series returned with error %v", err)
			}
			return
		}
		checkInvariants(t, s, false)
	})
}

func FuzzReadCSV(f *testing.F) {
	addSeeds(f, "sample.csv", "ghi_only.csv")
	f.Add([]byte("time,ghi_w_m2,air_temp_c,wind_m_s\n2025-01-01T01:00:00Z,0,1,0\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		s, err := ReadCSV(bytes.NewReader(data), "fuzz.csv")
		if err != nil {
			if s != nil {
				t.Fatalf("series returned with error %v", err)
			}
			return
		}
		checkInvariants(t, s, false)
	})
}
