package records

import (
	"fmt"
	"strings"
	"time"
)

// The plausible window of a record's dates: nothing the loader reads
// happened before EarliestYear, and nothing is recorded more than a year
// ahead of today, except the end of an approval or of a post, which may lie
// up to ten years ahead. A date outside the window is a typing slip (1926
// for 2026, 2062 for 2026) and rejects its row.
const EarliestYear = 1950

// laterColumns are the date columns that may lie years ahead.
var laterColumns = map[string]bool{"expires_on": true, "active_to": true}

type window struct {
	lo, hi, hiLater Day
}

// dateWindow is the plausible window for today by the clock now (time.Now
// when nil), today being the facility's day.
func dateWindow(now func() time.Time, loc *time.Location) window {
	if now == nil {
		now = time.Now
	}
	if loc == nil {
		loc = time.UTC
	}
	today := DayOf(now().In(loc))
	return window{lo: MakeDay(EarliestYear, time.January, 1), hi: today.AddYears(1), hiLater: today.AddYears(10)}
}

// check returns why a day is outside the window ("" when inside); cell is
// the value as written.
func (w window) check(d Day, later bool, cell string) string {
	if w.lo == 0 {
		return ""
	}
	hi := w.hi
	if later {
		hi = w.hiLater
	}
	switch {
	case d < w.lo:
		return fmt.Sprintf("%s is before %d, outside the plausible window %s … %s for a record", shortQuote(cell), EarliestYear, w.lo, hi)
	case d > hi:
		return fmt.Sprintf("%s is in the future, outside the plausible window %s … %s for a record", shortQuote(cell), w.lo, hi)
	}
	return ""
}

// maxSameWarnings is how many warnings with the same file and message are
// listed one by one; more are grouped into one.
const maxSameWarnings = 5

// groupWarnings groups warnings that repeat one message for one file (a
// header of 10,000 unnamed columns) into one, naming the first few columns
// and how many more there are. Order is kept.
func groupWarnings(ws []Warning) []Warning {
	type key struct{ file, msg string }
	n := map[key]int{}
	for _, w := range ws {
		n[key{w.File, w.Message}]++
	}
	out := make([]Warning, 0, len(ws))
	grouped := map[key]int{} // index in out
	cols := map[key][]string{}
	for _, w := range ws {
		k := key{w.File, w.Message}
		if n[k] <= maxSameWarnings {
			out = append(out, w)
			continue
		}
		if _, ok := grouped[k]; !ok {
			grouped[k] = len(out)
			out = append(out, Warning{File: w.File, Message: w.Message})
		}
		if len(cols[k]) < 3 {
			cols[k] = append(cols[k], w.Column)
		}
	}
	for k, i := range grouped {
		out[i].Column = fmt.Sprintf("%s and %d more", strings.Join(cols[k], ", "), n[k]-len(cols[k]))
		out[i].Message = fmt.Sprintf("%s (%d times)", out[i].Message, n[k])
	}
	return out
}
