package demo

import (
	"math"
	"slices"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// TestEveryCheckPlanted: the answer key holds at least one finding of every
// check in the catalogue, and nothing outside it.
func TestEveryCheckPlanted(t *testing.T) {
	s, err := generate()
	if err != nil {
		t.Fatal(err)
	}
	seen := map[string]bool{}
	for _, f := range s.planted {
		seen[f.check] = true
		if !slices.Contains(catalogue, f.check) {
			t.Errorf("planted %s is not a catalogue check", f.check)
		}
	}
	for _, c := range catalogue {
		if !seen[c] {
			t.Errorf("no planted %s", c)
		}
		if len(s.how[c]) == 0 {
			t.Errorf("%s has no explanation in PLANTED.md", c)
		}
	}
}

// TestPlantsAgree: where a check is both placed by hand and recomputed from
// the rows (the cold work stints), the two must give the same findings, so
// no routine row fires by accident.
func TestPlantsAgree(t *testing.T) {
	s, err := generate()
	if err != nil {
		t.Fatal(err)
	}
	evaluated := map[string]bool{}
	for _, f := range s.computed {
		evaluated[f.check] = true
	}
	for _, c := range []string{"cold.work.over_limit", "cold.work.should_cease"} {
		evaluated[c] = true // evaluated even when nothing fires
	}
	pick := func(fs []finding) []finding {
		var out []finding
		for _, f := range fs {
			if evaluated[f.check] {
				out = append(out, f)
			}
		}
		sortFindings(out)
		return out
	}
	got, want := pick(s.computed), pick(s.planted)
	if diff := cmp.Diff(want, got, cmp.AllowUnexported(finding{})); diff != "" {
		t.Errorf("computed findings differ from the answer key (-want +got):\n%s", diff)
	}
}

// TestWeatherMargins keeps every day clear of the thresholds, so a checker
// that rounds differently (or compares the displayed value) still agrees
// with the answer key.
func TestWeatherMargins(t *testing.T) {
	s, err := generate()
	if err != nil {
		t.Fatal(err)
	}
	for d := 1; d <= nDays; d++ {
		for _, th := range []float64{-20, -28} {
			if math.Abs(s.minWC[d]-th) < 0.5 {
				t.Errorf("Jan %d: minimum wind chill %.2f is within 0.5 of %v", d, s.minWC[d], th)
			}
		}
		if math.Abs(s.minAir[d]) < 0.5 {
			t.Errorf("Jan %d: minimum air %.1f is within 0.5 of 0 °C", d, s.minAir[d])
		}
	}
	// The month the brief describes: a day down to about −40 °C and a day
	// that stays above freezing.
	if got := slices.Min(s.minAir[1:]); got > -39 {
		t.Errorf("coldest day %.1f °C, want about −40", got)
	}
	if got := slices.Max(s.minAir[1:]); got <= 0 {
		t.Errorf("mildest day's minimum %.1f °C, want one above freezing", got)
	}
}

// TestWindChill checks the generator's own wind chill, which places the cold
// problems, against published tables.
func TestWindChill(t *testing.T) {
	tests := []struct {
		name    string
		airC    float64
		windKmh float64
		want    float64
	}{
		{"EC table 0 °C 10 km/h", 0, 10, -3},          // Environment Canada wind chill table: (0, 10) → −3
		{"EC table −10 °C 20 km/h", -10, 20, -18},     // Environment Canada: (−10, 20) → −18
		{"EC worked example", -25, 20, -37},           // Environment Canada's own worked example: (−25, 20) → −37
		{"EC table −35 °C 15 km/h", -35, 15, -48},     // Environment Canada: (−35, 15) → −48
		{"EC table −40 °C 10 km/h", -40, 10, -51},     // Environment Canada: (−40, 10) → −51
		{"calm: air temperature stands", -30, 4, -30}, // 2001 index undefined at or below 4.8 km/h
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := math.Round(windChill(tt.airC, tt.windKmh)); got != tt.want {
				t.Errorf("windChill(%v, %v) rounds to %v, want %v", tt.airC, tt.windKmh, got, tt.want)
			}
		})
	}
}

// TestWorkLimit checks the generator's copy of the ACGIH work/warm-up
// schedule against the published example and table cells.
func TestWorkLimit(t *testing.T) {
	tests := []struct {
		name      string
		air, wind float64
		light     bool
		wantLimit int
		wantCease bool
	}{
		// Saskatchewan/ACGIH published example: −35 °C, 8 km/h, moderate → 40 min, 4 breaks.
		{"published example", -35, 8, false, 40, false},
		// Same conditions, light work reads the next row colder (−38 to −39, 8 km/h) → 30 min.
		{"light work one row colder", -35, 8, true, 30, false},
		// ACGIH table: −26 to −28 °C, no noticeable wind → normal breaks.
		{"normal breaks", -27.5, 0, false, 0, false},
		// ACGIH table: −29 to −31 °C, 32 km/h column → 30 min.
		{"strong wind", -30, 40, false, 30, false},
		// ACGIH table: −43 °C and below → work should cease.
		{"cease", -44, 0, false, 0, true},
		// Rounded down to −25 °C or warmer: no limit from the table (checks.md).
		{"warmer than the table", -25.0, 30, false, 0, false},
		// −25.3 °C rounds down to −26: the first row, 24 km/h column → 55 min.
		{"floor, not round", -25.3, 20, false, 55, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			limit, cease := workLimit(tt.air, tt.wind, tt.light)
			if limit != tt.wantLimit || cease != tt.wantCease {
				t.Errorf("workLimit(%v, %v, %v) = %d, %v; want %d, %v", tt.air, tt.wind, tt.light, limit, cease, tt.wantLimit, tt.wantCease)
			}
		})
	}
}

// TestDogArea checks the generator's 9 CFR §3.6(c)(1) formula, which places
// the planted space problem, against the USDA worked example.
func TestDogArea(t *testing.T) {
	// USDA Animal Care tech note "Minimum Space Requirements for Dogs" (from
	// memory): a 31-inch dog needs (31 + 6)² / 144 = 9.51 ft².
	dog := &animal{species: "canis_familiaris", length: 31 * 2.54}
	got := requiredArea(dog) / 0.09290304 // back to ft²
	if math.Abs(got-9.51) > 0.005 {
		t.Errorf("required area for a 31-inch dog = %.3f ft², want 9.51", got)
	}
}
