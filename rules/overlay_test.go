package rules

import (
	"strconv"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// A committee keeps only its changes: the file is laid over the shipped
// defaults and the changes are listed old → new with their source.
func TestParseLimitsOver(t *testing.T) {
	src := `# our committee's changes
care:
  clean_every_days: 7   # [F] weekly, committee minute 2026-03
severity:
  enclosure.platform.missing: off
handling:
  max_duration_min:
    weighing: 3
`
	l, err := ParseLimitsOver("ours.yaml", []byte(src))
	if err != nil {
		t.Fatal(err)
	}
	if !l.Overlay() {
		t.Error("Overlay() = false")
	}
	// Kept from the defaults (limits.yaml): the other care limits, the other purposes, every species.
	if l.Care.SignificantRunDays != 2 || l.Care.ConcernResponseHours != 24 {
		t.Errorf("care defaults lost: %+v", l.Care)
	}
	if got := l.Handling.MaxDurationMin; got["weighing"] != 3 || got["transfer"] != 10 {
		t.Errorf("max_duration_min = %v, want weighing 3 laid over transfer 10", got)
	}
	if len(l.Species) != 4 || l.Care.CleanEveryDays != 7 || l.Severity["enclosure.platform.missing"] != "off" {
		t.Errorf("species %d, clean_every_days %d, severity %v", len(l.Species), l.Care.CleanEveryDays, l.Severity)
	}
	want := []LimitChange{
		{Key: "severity.enclosure.platform.missing", New: "off", Source: "[F] set by the committee"},
		{Key: "handling.max_duration_min.weighing", Old: "5", New: "3", Source: "[F] set by the committee"},
		{Key: "care.clean_every_days", Old: "14", New: "7", Source: "[F] weekly, committee minute 2026-03"},
	}
	got := l.Changes()
	if diff := cmp.Diff(sortChanges(want), sortChanges(got)); diff != "" {
		t.Errorf("Changes (-want +got):\n%s", diff)
	}
	if got, want := got[0].Line(), got[0].Key+": "; !strings.HasPrefix(got, want) {
		t.Errorf("Line() = %q", got)
	}
}

func sortChanges(c []LimitChange) []LimitChange {
	out := append([]LimitChange(nil), c...)
	for i := range out {
		for j := i + 1; j < len(out); j++ {
			if out[j].Key < out[i].Key {
				out[i], out[j] = out[j], out[i]
			}
		}
	}
	return out
}

// The shipped defaults read whole, or laid over themselves, change nothing.
func TestDefaultsUnchanged(t *testing.T) {
	d, err := Default()
	if err != nil {
		t.Fatal(err)
	}
	if c := d.Changes(); len(c) != 0 {
		t.Errorf("defaults: changes %v", c)
	}
	o, err := ParseLimitsOver("copy.yaml", DefaultLimits())
	if err != nil {
		t.Fatal(err)
	}
	if c := o.Changes(); len(c) != 0 {
		t.Errorf("defaults laid over themselves: changes %v", c)
	}
}

// Mistyped keys and values are refused at their line, in a file holding
// only changes as in a whole file.
func TestLimitsRefused(t *testing.T) {
	tests := []struct {
		name, src string
		line      int
		want      string
	}{
		{"purpose misspelt", "handling:\n  max_duration_min:\n    temperment_test: 10\n", 3,
			`handling.max_duration_min[temperment_test]: "temperment_test" is not a handling purpose`},
		{"ppe purpose misspelt", "handling:\n  required_ppe:\n    wieghing: [coverall]\n", 3, `"wieghing" is not a handling purpose`},
		{"ppe item misspelt", "handling:\n  required_ppe:\n    default: [coverals]\n", 3, `"coverals" is not a protective item`},
		{"sign misspelt", "health:\n  needs_vet: [wound, lamness]\n", 2, `"lamness" is not a sign`},
		{"species misspelt", "litter:\n  min_weaning_days:\n    vulpes_vulpse: 56\n", 3, `"vulpes_vulpse" is not a species profile`},
		{"unit in the value", "species:\n  vulpes_vulpes:\n    space:\n      adult_m2: 0.8 m2\n", 4, `"0.8 m2" is not a number`},
		{"unknown key", "care:\n  clean_evry_days: 7\n", 2, "clean_evry_days"},
		{"out of range", "cold:\n  bedding_days: 0\n", 2, "cold.bedding_days: 0 is out of range"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			_, err := ParseLimitsOver("ours.yaml", []byte(tc.src))
			if err == nil {
				t.Fatal("accepted")
			}
			if !strings.Contains(err.Error(), tc.want) {
				t.Errorf("err = %v, want it to contain %q", err, tc.want)
			}
			if prefix := "ours.yaml:" + itoa(tc.line) + ": "; !strings.HasPrefix(err.Error(), prefix) {
				t.Errorf("err = %v, want it to start %q", err, prefix)
			}
		})
	}
}

func itoa(n int) string { return strconv.Itoa(n) }

// KeyLine finds a severity override whose check id holds dots.
func TestKeyLineCheckID(t *testing.T) {
	l, err := ParseLimitsOver("ours.yaml", []byte("care:\n  clean_every_days: 7\nseverity:\n  care.observation.missed: note\n"))
	if err != nil {
		t.Fatal(err)
	}
	if got := l.KeyLine("severity[care.observation.missed]"); got != 4 {
		t.Errorf("KeyLine = %d, want 4", got)
	}
}
