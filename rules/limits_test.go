package rules

import (
	"bytes"
	"fmt"
	"slices"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

func TestDefaultLimitsLoad(t *testing.T) {
	l, err := LoadLimits(bytes.NewReader(DefaultLimits()), "limits.yaml")
	if err != nil {
		t.Fatal(err)
	}
	got := strings.Join(l.SpeciesCodes(), " ")
	if want := "canis_familiaris neogale_vison vulpes_lagopus vulpes_vulpes"; got != want {
		t.Errorf("species = %q, want %q", got, want)
	}
	// Council of Europe fur-animal recommendation (1999), Czech Decree 208/2004 §13: adult fox 0.8 m², 70 cm.
	if fox := l.Species["vulpes_vulpes"].Space; fox.AdultM2 != 0.8 || fox.MinHeightCm != 70 {
		t.Errorf("red fox space = %+v", fox)
	}
	d, err := l.Data()
	if err != nil {
		t.Fatal(err)
	}
	if d["staff"].(map[string]any)["rabies"].(map[string]any)["titer_every_months"].(map[string]any)["1"] != float64(6) {
		t.Errorf("titer_every_months not carried to data.limits: %v", d["staff"])
	}
}

func TestLoadLimitsErrors(t *testing.T) {
	base := string(DefaultLimits())
	// lineOf is the line a text starts on in the edited file, so the test
	// holds the error to the exact line a committee member would open.
	lineOf := func(src, text string) int {
		i := strings.Index(src, text)
		if i < 0 {
			t.Fatalf("%q not in the edited limits", text)
		}
		return strings.Count(src[:i], "\n") + 1
	}
	tests := []struct {
		name, src, at, want string
	}{
		{"unknown key", strings.Replace(base, "  bedding_days: 7", "  beding_days: 7", 1), "beding_days", "beding_days: unknown key"},
		{"wrong type", strings.Replace(base, "water_checks_min: 2", "water_checks_min: two", 1), "water_checks_min: two", `"two" is not a whole number`},
		{"out of range", strings.Replace(base, "water_checks_min: 2", "water_checks_min: 0", 1), "water_checks_min: 0", "cold.water_checks_min: 0 is out of range"},
		{"bad schedule cell", strings.Replace(base, "75/2, 55/3, 40/4]", "75/2, 55/3, 40-4]", 1), "40-4", "not a schedule cell"},
		{"species limit", strings.Replace(base, "adult_m2: 0.255", "adult_m2: -1", 1), "adult_m2: -1", "species[neogale_vison].space.adult_m2: -1 is out of range"},
		{"inverted range", strings.Replace(base, "humidity_pct: {min: 30, max: 70}", "humidity_pct: {min: 70, max: 30}", 1), "humidity_pct: {min: 70", "environment.humidity_pct.max: 30 is out of range: must be at least min"},
		{"empty", "", "", "mine.yaml: is empty"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := LoadLimits(strings.NewReader(tc.src), "mine.yaml")
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("err = %v, want one containing %q", err, tc.want)
			}
			prefix := "mine.yaml"
			if tc.at != "" {
				prefix = fmt.Sprintf("mine.yaml:%d: ", lineOf(tc.src, tc.at))
			}
			if !strings.HasPrefix(err.Error(), prefix) {
				t.Errorf("err = %v, want it to start %q", err, prefix)
			}
		})
	}
}

// TestLocalValues: the committee's own values under local: reach the rules
// as data.limits.local, appear among the limits in force, and a bad name
// or an empty value is refused with its line.
func TestLocalValues(t *testing.T) {
	base := string(DefaultLimits())
	good := base + "\nlocal:\n  weight_drop_pct: 10     # [F] our committee\n  muzzle_species: [vulpes_vulpes]\n  night:\n    from: \"22:00\"\n"
	l, err := ParseLimits("mine.yaml", []byte(good))
	if err != nil {
		t.Fatal(err)
	}
	data, err := l.Data()
	if err != nil {
		t.Fatal(err)
	}
	want := map[string]any{"weight_drop_pct": float64(10), "muzzle_species": []any{"vulpes_vulpes"}, "night": map[string]any{"from": "22:00"}}
	if diff := cmp.Diff(want, data["local"]); diff != "" {
		t.Errorf("data.limits.local (-want +got):\n%s", diff)
	}
	var lines []string
	for _, ln := range l.Lines() {
		if strings.HasPrefix(ln.Key, "local.") {
			lines = append(lines, ln.Key+" = "+ln.Value+" "+ln.Source)
		}
	}
	if !slices.Contains(lines, "local.weight_drop_pct = 10 [F] our committee") {
		t.Errorf("limits in force lack the local value: %q", lines)
	}
	// The shipped limits have no local section: a rule reading one finds nothing.
	def, err := Default()
	if err != nil {
		t.Fatal(err)
	}
	if d, _ := def.Data(); d["local"] != nil {
		t.Errorf("shipped limits have data.limits.local = %v", d["local"])
	}

	bad := []struct{ name, src, at, want string }{
		{"name not lower_snake_case", base + "\nlocal:\n  WeightDrop: 10\n", "WeightDrop", `local.WeightDrop: "WeightDrop" is not a lower_snake_case name`},
		{"nested name", base + "\nlocal:\n  night:\n    From: 1\n", "From: 1", `local.night.From: "From" is not a lower_snake_case name`},
		{"not a finite number", base + "\nlocal:\n  ratio: .nan\n", "ratio:", "local.ratio: is not a finite number"},
		{"empty value", base + "\nlocal:\n  weight_drop_pct:\n", "weight_drop_pct:", "local.weight_drop_pct: has no value"},
	}
	for _, tc := range bad {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseLimits("mine.yaml", []byte(tc.src))
			if err == nil || !strings.Contains(err.Error(), tc.want) {
				t.Fatalf("err = %v, want one containing %q", err, tc.want)
			}
			line := strings.Count(tc.src[:strings.LastIndex(tc.src, tc.at)], "\n") + 1
			if prefix := fmt.Sprintf("mine.yaml:%d: ", line); !strings.HasPrefix(err.Error(), prefix) {
				t.Errorf("err = %v, want it to start %q", err, prefix)
			}
		})
	}
}
