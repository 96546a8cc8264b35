package records

import (
	"testing"

	"github.com/google/go-cmp/cmp"
)

func TestRoundTimes(t *testing.T) {
	base := "name: Birchfall\ntime_zone: UTC\nbuildings:\n  - id: S1\n    exposure: outdoor\n"
	tests := []struct {
		name          string
		yaml          string
		first, second int
		err           string
	}{
		{name: "defaults", yaml: base, first: 8 * 60, second: 16 * 60},
		{name: "own times", yaml: base + "round_times:\n  first: \"07:15\"\n  second: \"15:45\"\n", first: 7*60 + 15, second: 15*60 + 45},
		{name: "only the first", yaml: base + "round_times: {first: \"06:30\"}\n", first: 6*60 + 30, second: 16 * 60},
		{name: "not a time", yaml: base + "round_times:\n  first: \"8 am\"\n",
			err: `facility.yaml:7: round_times.first: "8 am" is not a time of day (HH:MM, 24-hour, such as 08:00)`},
		{name: "second before first", yaml: base + "round_times:\n  first: \"17:00\"\n",
			err: "facility.yaml:6: round_times.second: the second round (16:00) must be due after the first (17:00)"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			set, err := Load(folder(map[string]string{"facility.yaml": tc.yaml}), testSpecies)
			if tc.err != "" {
				if err == nil || err.Error() != tc.err {
					t.Fatalf("Load error = %v, want %q", err, tc.err)
				}
				return
			}
			if set == nil {
				t.Fatalf("Load: %v", err)
			}
			first, second := set.Facility.RoundTimes.Due()
			if d := cmp.Diff([2]int{tc.first, tc.second}, [2]int{first, second}); d != "" {
				t.Errorf("round times (-want +got):\n%s", d)
			}
		})
	}
}
