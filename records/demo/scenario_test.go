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
		if !seen[c] && !unplanted[c] {
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
