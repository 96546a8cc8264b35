package reports

import (
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
)

// The chart's reference lines follow the limits in force, not fixed numbers.
func TestColdLines(t *testing.T) {
	tests := []struct {
		name string
		in   checker.ColdLines
		want []coldLine
	}{
		{"shipped defaults", checker.ColdLines{Bedding: -20, Shelter: -20, Frostbite: -28},
			[]coldLine{{-20, "bedding, shelter"}, {-28, "frostbite risk"}}},
		{"a committee's own", checker.ColdLines{Bedding: -15, Shelter: -25, Frostbite: -28},
			[]coldLine{{-15, "bedding"}, {-25, "shelter"}, {-28, "frostbite risk"}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if diff := cmp.Diff(tc.want, coldLines(tc.in), cmp.AllowUnexported(coldLine{})); diff != "" {
				t.Errorf("coldLines (-want +got):\n%s", diff)
			}
		})
	}
	if got := minus(-27.5); got != "−27.5" {
		t.Errorf("minus(-27.5) = %q", got)
	}
}
