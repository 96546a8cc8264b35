package reports

import (
	"testing"

	"welfare/records"
)

func TestShortRefs(t *testing.T) {
	refs := []records.Ref{"handling.csv:2", "handling.csv:3", "handling.csv:4"}
	tests := []struct {
		max  int
		want string
	}{
		{3, "handling.csv:2; handling.csv:3; handling.csv:4"},
		{2, "handling.csv:2; handling.csv:3; … and 1 more"},
	}
	for _, tc := range tests {
		if got := shortRefs(refs, tc.max); got != tc.want {
			t.Errorf("shortRefs(max %d) = %q, want %q", tc.max, got, tc.want)
		}
	}
}
