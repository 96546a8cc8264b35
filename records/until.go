package records

import "time"

// Until returns a copy of the set as its rounds and readings stood at t:
// care rounds, weather and indoor readings and outdoor stints started
// after t are left out, as they describe a moment that had not yet come. A
// date-only care round counts for its whole day. Events (handling, culls,
// deaths, observations) are kept: their other records (an animal's
// left_on, say) cannot be cut with them, and a cut would read as a
// mismatch. Everything else is shared with s, not copied.
//
// The morning view checks "today so far" this way, so a round due at 16:00
// is not judged from a 10:00 view with rows of the afternoon in the file.
func (s *Set) Until(t time.Time) *Set {
	c := *s
	today := DayOf(t)
	if s.Location != nil {
		today = DayOf(t.In(s.Location))
	}
	c.Care = keep(s.Care, func(r *CareRound) bool {
		if r.DateOnly {
			return r.Day <= today
		}
		return !r.At.After(t)
	})
	if s.care != nil {
		st := s.care
		c.care = st.Filter(func(i int) bool {
			v := st.View(i)
			if v.DateOnly {
				return v.Day <= today
			}
			return !v.At.After(t)
		})
	}
	c.Weather = keep(s.Weather, func(r *Weather) bool { return !r.At.After(t) })
	c.Work = keep(s.Work, func(r *OutdoorWork) bool { return !r.StartedAt.After(t) })
	c.Environment = keep(s.Environment, func(r *EnvironmentReading) bool { return !r.At.After(t) })
	return &c
}

func keep[T any](rows []T, ok func(*T) bool) []T {
	var out []T
	for i := range rows {
		if ok(&rows[i]) {
			out = append(out, rows[i])
		}
	}
	return out
}
