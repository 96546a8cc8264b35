package records

import (
	"fmt"
	"time"
)

// Day is a calendar day counted from 1970-01-01 (day 1; 0 means "not
// recorded"). Checks work in whole local days, and an integer day keeps
// millions of rows small and their arithmetic exact.
type Day int32

const epochOffset = 1 // so that 1970-01-01 is day 1 and the zero Day is "none"

// DayOf returns the calendar day of t in t's own location.
func DayOf(t time.Time) Day {
	// The local clock's seconds since 1970-01-01T00:00 (t.Date counts
	// from the same sum), floored to whole days.
	_, off := t.Zone()
	s := t.Unix() + int64(off)
	d := s / 86400
	if s%86400 < 0 {
		d--
	}
	return Day(d) + epochOffset
}

// MakeDay returns the Day of a calendar date.
func MakeDay(y int, m time.Month, d int) Day {
	return DayOf(time.Date(y, m, d, 0, 0, 0, 0, time.UTC))
}

// ParseDay reads YYYY-MM-DD.
func ParseDay(s string) (Day, error) {
	t, err := time.Parse("2006-01-02", s)
	if err != nil {
		return 0, fmt.Errorf("%q is not a date (YYYY-MM-DD)", s)
	}
	return DayOf(t), nil
}

// IsZero reports whether no day was recorded.
func (d Day) IsZero() bool { return d == 0 }

// Time is midnight UTC of the day.
func (d Day) Time() time.Time {
	return time.Unix(int64(d-epochOffset)*86400, 0).UTC()
}

// In is midnight of the day in loc.
func (d Day) In(loc *time.Location) time.Time {
	y, m, dd := d.Time().Date()
	return time.Date(y, m, dd, 0, 0, 0, 0, loc)
}

// String is YYYY-MM-DD, or "" for no day.
func (d Day) String() string {
	if d == 0 {
		return ""
	}
	return d.Time().Format("2006-01-02")
}

// AddMonths is the same day-of-month n months later, normalised as
// time.AddDate does (Jan 31 + 1 month = Mar 3 or 2).
func (d Day) AddMonths(n int) Day { return DayOf(d.Time().AddDate(0, n, 0)) }

// AddYears is the same date n years later (Feb 29 normalises to Mar 1).
func (d Day) AddYears(n int) Day { return DayOf(d.Time().AddDate(n, 0, 0)) }

// MarshalText writes YYYY-MM-DD so days read naturally in JSON.
func (d Day) MarshalText() ([]byte, error) { return []byte(d.String()), nil }
