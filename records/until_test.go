package records

import (
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"
)

// Until keeps the rounds and readings written by a moment, a date-only
// round for its whole day, and every event.
func TestUntil(t *testing.T) {
	loc, err := time.LoadLocation("America/Winnipeg")
	if err != nil {
		t.Fatal(err)
	}
	at := func(d, h, m int) time.Time { return time.Date(2026, 1, d, h, m, 0, 0, loc) }
	day := MakeDay(2026, 1, 10)
	s := &Set{
		Location: loc,
		Care: []CareRound{
			{Ref: "a", At: at(10, 7, 30), Day: day},
			{Ref: "b", At: at(10, 15, 30), Day: day},
			{Ref: "c", Day: day, DateOnly: true, At: at(10, 0, 0)},
			{Ref: "d", Day: day + 1, DateOnly: true, At: at(11, 0, 0)},
		},
		Weather:     []Weather{{Ref: "e", At: at(10, 9, 0)}, {Ref: "f", At: at(10, 9, 1)}},
		Work:        []OutdoorWork{{Ref: "g", StartedAt: at(10, 8, 0), EndedAt: at(10, 10, 0)}, {Ref: "h", StartedAt: at(10, 12, 0)}},
		Environment: []EnvironmentReading{{Ref: "i", At: at(11, 1, 0)}},
		Handling:    []Handling{{Ref: "j", At: at(10, 14, 0)}},
	}
	u := s.Until(at(10, 9, 0))
	var got []Ref
	for _, r := range u.Care {
		got = append(got, r.Ref)
	}
	for _, r := range u.Weather {
		got = append(got, r.Ref)
	}
	for _, r := range u.Work {
		got = append(got, r.Ref)
	}
	for _, r := range u.Environment {
		got = append(got, r.Ref)
	}
	for _, r := range u.Handling {
		got = append(got, r.Ref)
	}
	if d := cmp.Diff([]Ref{"a", "c", "e", "g", "j"}, got); d != "" {
		t.Errorf("kept rows (-want +got):\n%s", d)
	}
	if len(s.Care) != 4 {
		t.Errorf("Until changed the set it was given")
	}
}
