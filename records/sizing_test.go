package records

import (
	"fmt"
	"strings"
	"testing"
)

// TestRowsSizedFromFileLength loads care files large enough for the rows to
// be sized from the file's length after the first blocks (see grow): when
// the later rows are longer than the first ones (the estimate falls short
// and reading goes on by blocks) and when they are shorter (it overshoots),
// every row is kept, once, in file order.
func TestRowsSizedFromFileLength(t *testing.T) {
	const n = 80_000
	row := func(i int, long bool) string {
		note := ""
		if long {
			note = strings.Repeat("fresh straw ", 12)
		}
		return fmt.Sprintf("2025-02-%02dT07:00,E1,K1,yes,yes,ok,%s\n", 1+i%28, note)
	}
	tests := []struct {
		name     string
		longFrom int // rows from this index have a long note
		longTo   int
	}{
		{"later rows longer", n / 2, n},
		{"earlier rows longer", 0, n / 2},
		{"all alike", n, n},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var b strings.Builder
			b.WriteString("checked_at,enclosure_id,staff_id,observed,fed,water,notes\n")
			for i := range n {
				b.WriteString(row(i, i >= tc.longFrom && i < tc.longTo))
			}
			s := mustLoad(t, folder(map[string]string{"daily_care.csv": b.String()}))
			if len(s.Care) != n {
				t.Fatalf("%d care rounds, want %d", len(s.Care), n)
			}
			for i, r := range s.Care {
				if want := Ref(fmt.Sprintf("daily_care.csv:%d", i+2)); r.Ref != want {
					t.Fatalf("care round %d is %s, want %s", i, r.Ref, want)
				}
			}
		})
	}
}
