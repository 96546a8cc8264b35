package records

import (
	"testing"
	"time"
)

// DayOf counts the local clock's days; it must agree with the calendar date
// time.Date gives, in zones east and west of UTC, across a DST change, for
// instants before 1970 and at local midnight.
func TestDayOfAgreesWithTheCalendar(t *testing.T) {
	var zones []*time.Location
	for _, name := range []string{"UTC", "America/Winnipeg", "Europe/Oslo", "Pacific/Kiritimati", "Pacific/Pago_Pago"} {
		loc, err := time.LoadLocation(name)
		if err != nil {
			t.Fatal(err)
		}
		zones = append(zones, loc)
	}
	zones = append(zones, time.FixedZone("-0930", -(9*3600+1800)))
	calendar := func(t time.Time) Day {
		y, m, d := t.Date()
		return Day(time.Date(y, m, d, 0, 0, 0, 0, time.UTC).Unix()/86400) + epochOffset
	}
	starts := []time.Time{
		time.Date(2026, 3, 7, 0, 0, 0, 0, time.UTC),   // the week of a spring DST change
		time.Date(2025, 10, 24, 0, 0, 0, 0, time.UTC), // and of an autumn one
		time.Date(1969, 12, 29, 0, 0, 0, 0, time.UTC), // across 1970
		time.Date(1901, 1, 1, 0, 0, 0, 0, time.UTC),
	}
	n := 0
	for _, loc := range zones {
		for _, s := range starts {
			for m := 0; m < 7*24*60; m += 17 {
				at := s.Add(time.Duration(m) * time.Minute).In(loc)
				if got, want := DayOf(at), calendar(at); got != want {
					t.Fatalf("DayOf(%v) = %v, want %v", at, got, want)
				}
				n++
			}
			midnight := time.Date(2026, 1, 10, 0, 0, 0, 0, loc)
			if got := DayOf(midnight); got != MakeDay(2026, 1, 10) || DayOf(midnight.Add(-time.Second)) != MakeDay(2026, 1, 9) {
				t.Errorf("%v: local midnight on day %v", loc, got)
			}
		}
	}
	if DayOf(time.Time{}) != calendar(time.Time{}) {
		t.Errorf("zero time: %v, want %v", DayOf(time.Time{}), calendar(time.Time{}))
	}
	t.Logf("%d instants", n)
}
