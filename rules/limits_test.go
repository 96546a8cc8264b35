package rules

import (
	"bytes"
	"strings"
	"testing"
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
	tests := []struct {
		name, src, want string
	}{
		{"unknown key", strings.Replace(base, "  bedding_days: 7", "  beding_days: 7", 1), "field beding_days not found"},
		{"wrong type", strings.Replace(base, "water_checks_min: 2", "water_checks_min: two", 1), "cannot unmarshal"},
		{"out of range", strings.Replace(base, "water_checks_min: 2", "water_checks_min: 0", 1), "cold.water_checks_min: 0 is out of range"},
		{"bad cell", strings.Replace(base, "75/2, 55/3, 40/4]", "75/2, 55/3, 40-4]", 1), "not a schedule cell"},
		{"empty", "", "the file is empty"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := LoadLimits(strings.NewReader(tc.src), "mine.yaml")
			if err == nil || !strings.Contains(err.Error(), tc.want) || !strings.HasPrefix(err.Error(), "mine.yaml") {
				t.Fatalf("err = %v, want one starting mine.yaml and containing %q", err, tc.want)
			}
			if tc.name != "empty" && tc.name != "bad cell" && !strings.HasPrefix(err.Error(), "mine.yaml:") {
				t.Errorf("err %v has no line", err)
			}
		})
	}
}
