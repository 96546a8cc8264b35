package records

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"time"
)

// parseBool reads yes/no, y/n, true/false, 1/0 in any case. The caller has
// already handled the empty cell (not recorded).
func parseBool(s string) (Bool, bool) {
	switch len(s) {
	case 1:
		switch s[0] {
		case 'y', 'Y', '1':
			return Yes, true
		case 'n', 'N', '0':
			return No, true
		}
	case 2, 3, 4, 5:
		// Only ASCII letters lower-case to these words (strings.ToLower
		// would give the same answer), so the cell is compared byte by
		// byte without making a lower-case copy.
		switch {
		case foldsTo(s, "yes"), foldsTo(s, "true"):
			return Yes, true
		case foldsTo(s, "no"), foldsTo(s, "false"):
			return No, true
		}
	}
	return NotRecorded, false
}

// foldsTo reports whether s is lower with ASCII letters in any case.
func foldsTo(s, lower string) bool {
	if len(s) != len(lower) {
		return false
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		if 'A' <= c && c <= 'Z' {
			c += 'a' - 'A'
		}
		if c != lower[i] {
			return false
		}
	}
	return true
}

// parseNumber reads a decimal number with a point. NaN and infinities are
// not measurements, and "12,5" (a decimal comma) is refused rather than
// guessed at.
func parseNumber(s string) (float64, bool) {
	// Whole grams and counts are most cells: up to 15 digits a float64
	// holds them exactly, as ParseFloat reads them.
	if len(s) > 0 && len(s) <= 15 {
		if n, ok := digits(s, 0, len(s)); ok {
			return float64(n), true
		}
	}
	f, err := strconv.ParseFloat(s, 64)
	if err != nil || f != f || f > 1e300 || f < -1e300 {
		return 0, false
	}
	// ParseFloat also takes hex floats and underscores; a keeper's record does not.
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !(c >= '0' && c <= '9' || c == '.' || c == '-' || c == '+' || c == 'e' || c == 'E') {
			return 0, false
		}
	}
	return f, true
}

// parseList splits a ;-separated cell, trimming each value and dropping empties.
func parseList(s string, intern func(string) string) []string {
	n := strings.Count(s, ";") + 1
	out := make([]string, 0, n)
	for part := range strings.SplitSeq(s, ";") {
		part = strings.TrimSpace(part)
		if part != "" {
			out = append(out, intern(part))
		}
	}
	return out
}

// digits reads s[i:j] as a non-negative decimal number.
func digits(s string, i, j int) (int, bool) {
	n := 0
	for k := i; k < j; k++ {
		c := s[k]
		if c < '0' || c > '9' {
			return 0, false
		}
		n = n*10 + int(c-'0')
	}
	return n, true
}

func daysIn(y, m int) int {
	switch m {
	case 2:
		if y%4 == 0 && (y%100 != 0 || y%400 == 0) {
			return 29
		}
		return 28
	case 4, 6, 9, 11:
		return 30
	}
	return 31
}

// ymd reads YYYY-MM-DD at the start of s.
func ymd(s string) (y, m, d int, ok bool) {
	if len(s) < 10 || s[4] != '-' || s[7] != '-' {
		return 0, 0, 0, false
	}
	var ok1, ok2, ok3 bool
	y, ok1 = digits(s, 0, 4)
	m, ok2 = digits(s, 5, 7)
	d, ok3 = digits(s, 8, 10)
	if !ok1 || !ok2 || !ok3 || m < 1 || m > 12 || d < 1 || d > daysIn(y, m) {
		return 0, 0, 0, false
	}
	return y, m, d, true
}

// civilDay counts days from 1970-01-01 (as day 1, like Day) without going
// through time.Time: dates are the most common cell and this keeps them cheap.
// The algorithm is the proleptic Gregorian days-from-civil computation.
func civilDay(y, m, d int) Day {
	if m <= 2 {
		y--
	}
	era := y / 400
	if y < 0 && y%400 != 0 {
		era--
	}
	yoe := y - era*400
	mp := (m + 9) % 12
	doy := (153*mp+2)/5 + d - 1
	doe := yoe*365 + yoe/4 - yoe/100 + doy
	return Day(era*146097+doe-719468) + epochOffset
}

// parseDate reads YYYY-MM-DD.
func parseDate(s string) (Day, error) {
	y, m, d, ok := ymd(s)
	if !ok || len(s) != 10 {
		return 0, fmt.Errorf("%q is not a date (YYYY-MM-DD)", s)
	}
	return civilDay(y, m, d), nil
}

// parseDateTime reads YYYY-MM-DDTHH:MM, YYYY-MM-DDTHH:MM:SS (a space may
// stand for the T) in loc, or RFC 3339 with an offset. The result is always
// in loc, so that its calendar day is the facility's day.
func parseDateTime(s string, loc *time.Location) (time.Time, error) {
	return (*zoneCache)(nil).parseDateTime(s, loc)
}

// parseDateTime is parseDateTime with the zone of the last local date kept
// in z (nil: none kept).
func (z *zoneCache) parseDateTime(s string, loc *time.Location) (time.Time, error) {
	if len(s) == 16 || len(s) == 19 {
		if t, ok := z.localDateTime(s, loc); ok {
			return t, nil
		}
	}
	if len(s) > 19 {
		norm := s
		if s[10] == ' ' {
			norm = s[:10] + "T" + s[11:]
		}
		for _, layout := range [...]string{time.RFC3339Nano, "2006-01-02T15:04Z07:00"} {
			if t, err := time.Parse(layout, norm); err == nil {
				return t.In(loc), nil
			}
		}
	}
	return time.Time{}, fmt.Errorf("%q is not a date-time (YYYY-MM-DDTHH:MM, with optional :SS, or RFC 3339 with an offset)", s)
}

func (z *zoneCache) localDateTime(s string, loc *time.Location) (time.Time, bool) {
	y, mo, d, ok := ymd(s)
	if !ok || (s[10] != 'T' && s[10] != ' ') || s[13] != ':' {
		return time.Time{}, false
	}
	h, ok1 := digits(s, 11, 13)
	mi, ok2 := digits(s, 14, 16)
	sec, ok3 := 0, true
	if len(s) == 19 {
		if s[16] != ':' {
			return time.Time{}, false
		}
		sec, ok3 = digits(s, 17, 19)
	}
	if !ok1 || !ok2 || !ok3 || h > 23 || mi > 59 || sec > 59 {
		return time.Time{}, false
	}
	return z.date(y, mo, d, h, mi, sec, loc), true
}

// zoneCache keeps the zone in force at the local midnight of the last date
// a local date-time was read on: a file's million times fall on a few
// hundred dates, and time.Date looks the zone up for every one of them.
type zoneCache struct {
	loc        *time.Location
	y, m, d    int
	midnight   int64 // the date's midnight as if local time were UTC, in seconds
	offset     int64 // the zone's offset east of UTC, in seconds
	start, end int64 // the zone's bounds (unix seconds, end excluded)
}

// date is time.Date(y, mo, d, h, mi, sec, 0, loc), exactly: time.Date
// takes the zone in force at the local clock reading read as UTC, and keeps
// it when the instant it gives lies in that zone too. When both lie within
// the cached zone the result is the same instant in the same location; any
// other time (near a change of offset) is left to time.Date.
func (z *zoneCache) date(y, mo, d, h, mi, sec int, loc *time.Location) time.Time {
	if z == nil {
		return time.Date(y, time.Month(mo), d, h, mi, sec, 0, loc)
	}
	if z.loc != loc || z.y != y || z.m != mo || z.d != d {
		t0 := time.Date(y, time.Month(mo), d, 0, 0, 0, 0, loc)
		_, off := t0.Zone()
		from, to := t0.ZoneBounds()
		*z = zoneCache{loc: loc, y: y, m: mo, d: d, offset: int64(off),
			midnight: int64(civilDay(y, mo, d)-epochOffset) * 86400, start: math.MinInt64, end: math.MaxInt64}
		if !from.IsZero() {
			z.start = from.Unix()
		}
		if !to.IsZero() {
			z.end = to.Unix()
		}
	}
	local := z.midnight + int64(h*3600+mi*60+sec)
	utc := local - z.offset
	if local < z.start || local >= z.end || utc < z.start || utc >= z.end {
		return time.Date(y, time.Month(mo), d, h, mi, sec, 0, loc)
	}
	return time.Unix(utc, 0).In(loc)
}

// dayOf is DayOf(t), without looking t's zone up when t is in the cached
// zone's location and bounds (its offset is then the cached one).
func (z *zoneCache) dayOf(t time.Time) Day {
	if z.loc == nil || t.Location() != z.loc {
		return DayOf(t)
	}
	u := t.Unix()
	if u < z.start || u >= z.end {
		return DayOf(t)
	}
	s := u + z.offset
	d := s / 86400
	if s%86400 < 0 {
		d--
	}
	return Day(d) + epochOffset
}

// unitKind names a measured quantity whose column carries its unit as a suffix.
type unitKind string

// unitAlt is one accepted unit of a quantity: the column suffix, how it is
// written, and how to convert to the SI unit the Go field holds.
type unitAlt struct {
	suffix string
	label  string
	toSI   func(float64) float64
}

// Conversion factors are the exact ones of NIST SP 811 (2008), Appendix B.
var (
	identity = func(v float64) float64 { return v }
	fToC     = func(v float64) float64 { return (v - 32) / 1.8 } // SP 811 B.8: t/°C = (t/°F − 32)/1.8
	mphToKmh = func(v float64) float64 { return v * 1.609344 }   // SP 811 B.8: 1 mi/h = 1.609344 km/h (exact)
	msToKmh  = func(v float64) float64 { return v * 3.6 }        // 1 m/s = 3600 m / 1000 s·h⁻¹ = 3.6 km/h (exact)
	inToCm   = func(v float64) float64 { return v * 2.54 }       // SP 811 B.8: 1 in = 2.54 cm (exact)
	ft2ToM2  = func(v float64) float64 { return v * 0.09290304 } // SP 811 B.8: 1 ft² = 9.290304 E-02 m² (exact)
	lbToKg   = func(v float64) float64 { return v * 0.45359237 } // SP 811 B.8: 1 lb (avoirdupois) = 0.45359237 kg (exact)
)

// units lists each quantity's alternatives, SI first.
var units = map[unitKind][]unitAlt{
	"temperature": {{"_c", "°C", identity}, {"_f", "°F", fToC}},
	"speed":       {{"_kmh", "km/h", identity}, {"_mph", "mph", mphToKmh}, {"_ms", "m/s", msToKmh}},
	"length":      {{"_cm", "cm", identity}, {"_in", "in", inToCm}},
	"area":        {{"_m2", "m²", identity}, {"_ft2", "ft²", ft2ToM2}},
	"mass":        {{"_kg", "kg", identity}, {"_lb", "lb", lbToKg}},
	"thickness":   {{"_mm", "mm", identity}},
	"duration":    {{"_min", "min", identity}},
	"grams":       {{"_g", "g", identity}},
}

// isID reports whether s is 1–64 letters, digits or -_.:/ (records.md).
func isID(s string) bool {
	if len(s) == 0 || len(s) > 64 {
		return false
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !(c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' ||
			c == '-' || c == '_' || c == '.' || c == ':' || c == '/') {
			return false
		}
	}
	return true
}

// IsCode reports whether s is a code as records and limits write them:
// lower snake_case, a lower-case letter, then lower-case letters, digits and
// underscores.
func IsCode(s string) bool {
	if len(s) == 0 || s[0] < 'a' || s[0] > 'z' {
		return false
	}
	for i := 1; i < len(s); i++ {
		c := s[i]
		if !(c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || c == '_') {
			return false
		}
	}
	return true
}
