package records

import (
	"fmt"
	"time"

	"go.yaml.in/yaml/v3"
)

// RoundTimes is facility.yaml's round_times: the local times by which the
// day's first and second care rounds are due. Empty means the default.
type RoundTimes struct {
	// First is when the first round is due (animals observed, fed, a first
	// water check); default 08:00.
	First string `yaml:"first" ref:"time of day HH:MM (default 08:00)"`
	// Second is when the second round is due (the second water check on a
	// freezing or hot day); default 16:00.
	Second string `yaml:"second" ref:"time of day HH:MM (default 16:00)"`
}

// Default round times: a morning and an afternoon round, common practice
// for the twice-daily water checks of freezing and hot days.
const (
	DefaultFirstRound  = "08:00"
	DefaultSecondRound = "16:00"
)

// Due returns the first and second round times as minutes after midnight,
// the defaults standing in for what facility.yaml leaves out. Values that
// do not parse were refused when the facility was loaded.
func (rt RoundTimes) Due() (first, second int) {
	first, _ = ParseClock(rt.First)
	second, _ = ParseClock(rt.Second)
	if rt.First == "" {
		first, _ = ParseClock(DefaultFirstRound)
	}
	if rt.Second == "" {
		second, _ = ParseClock(DefaultSecondRound)
	}
	return first, second
}

// ParseClock reads a time of day written HH:MM (24-hour) as minutes after
// midnight.
func ParseClock(s string) (int, error) {
	t, err := time.Parse("15:04", s)
	if err != nil || len(s) != 5 {
		return 0, fmt.Errorf("%q is not a time of day (HH:MM, 24-hour, such as 08:00)", s)
	}
	return t.Hour()*60 + t.Minute(), nil
}

func (rt RoundTimes) problems(doc *yaml.Node) []*LoadError {
	var out []*LoadError
	ok := true
	for _, f := range []struct{ key, v string }{{"round_times.first", rt.First}, {"round_times.second", rt.Second}} {
		if f.v == "" {
			continue
		}
		if _, err := ParseClock(f.v); err != nil {
			out = append(out, &LoadError{File: facilityFile, Line: KeyLine(doc, f.key), Column: f.key, Reason: err.Error()})
			ok = false
		}
	}
	if first, second := rt.Due(); ok && second <= first {
		out = append(out, &LoadError{File: facilityFile, Line: KeyLine(doc, "round_times"), Column: "round_times.second",
			Reason: fmt.Sprintf("the second round (%s) must be due after the first (%s)", clock(second), clock(first))})
	}
	return out
}

func clock(min int) string { return fmt.Sprintf("%02d:%02d", min/60, min%60) }
