package records

import (
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"slices"
	"strings"
	"testing"
)

// The prefetching reader gives exactly what the plain one gives: every
// row, line, span and error, in order, across batch edges, through
// unclosed and misplaced quotes, rows over several lines, and a line
// over the cap that stops the file.
func TestPrefetchRowsMatchesPlainReading(t *testing.T) {
	var b strings.Builder
	b.WriteString("checked_at,enclosure_id,notes\n")
	for i := range 3*prefetchBatch + 7 {
		switch {
		case i == prefetchBatch-1:
			b.WriteString("2026-01-10T07:00,E1,\"two\nlines\"\n")
		case i == prefetchBatch+3:
			b.WriteString("2026-01-10T07:00,E1,bad\"quote\n")
		case i == 2*prefetchBatch:
			b.WriteString("2026-01-10T07:00,E1,\"never closed\n")
		default:
			fmt.Fprintf(&b, "2026-01-10T07:00,E%d,n%d\n", i%9, i)
		}
	}
	whole := b.String()
	long := whole + "2026-01-10T07:00,E1," + strings.Repeat("x", MaxLineBytes+1) + "\nlast,row,after\n"
	for name, text := range map[string]string{"to the end": whole, "stopped by a long line": long} {
		t.Run(name, func(t *testing.T) {
			plain := &csvRows{r: newCSVReader(strings.NewReader(text)), base: "daily_care.csv:"}
			pf := prefetch(&csvRows{r: newCSVReader(strings.NewReader(text)), base: "daily_care.csv:"})
			defer pf.close()
			rows, errs := 0, 0
			for {
				wr, wl, we := plain.next()
				ws, wend := plain.span()
				gr, gl, ge := pf.next()
				gs, gend := pf.span()
				if !slices.Equal(wr, gr) || wl != gl || fmt.Sprint(we) != fmt.Sprint(ge) || ws != gs || wend != gend {
					t.Fatalf("row %d: prefetch gave %q line %d err %v span %d-%d; plain %q line %d err %v span %d-%d",
						rows, gr, gl, ge, gs, gend, wr, wl, we, ws, wend)
				}
				if we != nil {
					errs++
				}
				if we == io.EOF || (we != nil && !isRowError(we)) {
					if _, _, again := pf.next(); fmt.Sprint(again) != fmt.Sprint(we) {
						t.Errorf("after the end: %v, want %v again", again, we)
					}
					break
				}
				rows++
			}
			if rows < 2*prefetchBatch || errs < 2 {
				t.Errorf("%d rows and %d errors compared; want every row and the planted errors", rows, errs)
			}
		})
	}
}

func isRowError(err error) bool {
	var pe *csv.ParseError
	return errors.As(err, &pe)
}
