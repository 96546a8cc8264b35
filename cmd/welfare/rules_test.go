package main

import (
	"strings"
	"testing"
)

// TestRulesInput: 'welfare rules input KIND' prints the fields a rule may
// read, from the same schema the compiler checks rules against.
func TestRulesInput(t *testing.T) {
	tests := []struct {
		args     []string
		code     int
		contains []string
	}{
		{[]string{"rules", "input", "enclosure"}, exitOK, []string{
			"input.care.unobserved[].days", "integer",
			"input.cold.days_at_or_past_bedding_limits[].days_since_bedding", "integer or null",
			"input.ref", "string or null",
		}},
		{[]string{"rules", "input", "staff"}, exitOK, []string{"input.name", "input.staff.handled[].rabies.primary_on", "day (YYYY-MM-DD) or null"}},
		{[]string{"rules", "input", "cage"}, exitUsage, []string{`no subject kind "cage"`}},
		{[]string{"rules", "input"}, exitUsage, []string{"rules input needs one subject KIND"}},
	}
	for _, tt := range tests {
		t.Run(strings.Join(tt.args, " "), func(t *testing.T) {
			code, out, errOut := runMain(t, tt.args...)
			if code != tt.code {
				t.Fatalf("exit %d, want %d\n%s%s", code, tt.code, out, errOut)
			}
			for _, s := range tt.contains {
				if !strings.Contains(out+errOut, s) {
					t.Errorf("output lacks %q:\n%s%s", s, out, errOut)
				}
			}
		})
	}
}
