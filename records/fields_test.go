package records

import (
	"math"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"
)

func TestParseBool(t *testing.T) {
	tests := []struct {
		in     string
		want   Bool
		wantOK bool
	}{
		{"yes", Yes, true}, {"YES", Yes, true}, {"Yes", Yes, true}, {"y", Yes, true}, {"Y", Yes, true},
		{"true", Yes, true}, {"TRUE", Yes, true}, {"1", Yes, true},
		{"no", No, true}, {"No", No, true}, {"n", No, true}, {"false", No, true}, {"False", No, true}, {"0", No, true},
		{"maybe", NotRecorded, false}, {"2", NotRecorded, false}, {"yess", NotRecorded, false}, {"t", NotRecorded, false}, {"yeſ", NotRecorded, false}, {"\u212Aes", NotRecorded, false},
	}
	for _, tt := range tests {
		t.Run(tt.in, func(t *testing.T) {
			got, ok := parseBool(tt.in)
			if got != tt.want || ok != tt.wantOK {
				t.Errorf("parseBool(%q) = %v, %v; want %v, %v", tt.in, got, ok, tt.want, tt.wantOK)
			}
		})
	}
}

func TestParseNumber(t *testing.T) {
	tests := []struct {
		in     string
		want   float64
		wantOK bool
	}{
		{"12.5", 12.5, true}, {"-40", -40, true}, {"+3", 3, true}, {"1e2", 100, true}, {"0", 0, true},
		{"12,5", 0, false}, // a decimal comma is refused, not guessed
		{"NaN", 0, false}, {"Inf", 0, false}, {"0x10", 0, false}, {"1_000", 0, false}, {"12 kg", 0, false},
	}
	for _, tt := range tests {
		t.Run(tt.in, func(t *testing.T) {
			got, ok := parseNumber(tt.in)
			if got != tt.want || ok != tt.wantOK {
				t.Errorf("parseNumber(%q) = %v, %v; want %v, %v", tt.in, got, ok, tt.want, tt.wantOK)
			}
		})
	}
}

func TestParseDate(t *testing.T) {
	tests := []struct {
		in      string
		want    Day
		wantErr bool
	}{
		// 2026-01-01T00:00:00Z is Unix time 1767225600 = 20454 days (from memory,
		// checked by the arithmetic 20454 × 86400); Day counts 1970-01-01 as 1.
		{"2026-01-01", 20455, false},
		{"1970-01-01", 1, false},
		{"2024-02-29", MakeDay(2024, 2, 29), false}, // leap year (Gregorian rule, common practice)
		{"2100-02-28", MakeDay(2100, 2, 28), false},
		{"2023-02-29", 0, true}, // not a leap year
		{"2100-02-29", 0, true}, // century not divisible by 400
		{"2026-13-01", 0, true},
		{"2026-1-5", 0, true},
		{"15/01/2026", 0, true},
		{"2026-01-15T07:00", 0, true},
	}
	for _, tt := range tests {
		t.Run(tt.in, func(t *testing.T) {
			got, err := parseDate(tt.in)
			if (err != nil) != tt.wantErr || got != tt.want {
				t.Errorf("parseDate(%q) = %v, %v; want %v, error %v", tt.in, got, err, tt.want, tt.wantErr)
			}
		})
	}
}

// civilDay must agree with the time package on every day across a wide span.
func TestCivilDayMatchesTime(t *testing.T) {
	for d := time.Date(1899, 1, 1, 0, 0, 0, 0, time.UTC); d.Year() < 2101; d = d.AddDate(0, 0, 1) {
		got := civilDay(d.Year(), int(d.Month()), d.Day())
		if want := DayOf(d); got != want {
			t.Fatalf("civilDay(%s) = %d, want %d", d.Format("2006-01-02"), got, want)
		}
	}
}

func TestParseDateTime(t *testing.T) {
	loc, err := time.LoadLocation("America/Winnipeg")
	if err != nil {
		t.Fatal(err)
	}
	// Winnipeg keeps Central Standard Time, UTC−6, in January and Central
	// Daylight Time, UTC−5, in July (IANA tz database, America/Winnipeg).
	jan := time.Date(2026, 1, 15, 13, 0, 0, 0, time.UTC)
	tests := []struct {
		in      string
		want    time.Time
		wantErr bool
	}{
		{"2026-01-15T07:00", jan, false},
		{"2026-01-15 07:00", jan, false},
		{"2026-01-15T07:00:30", jan.Add(30 * time.Second), false},
		{"2026-01-15 07:00:30", jan.Add(30 * time.Second), false},
		{"2026-07-15T07:00", time.Date(2026, 7, 15, 12, 0, 0, 0, time.UTC), false},
		{"2026-01-15T13:00:00Z", jan, false},
		{"2026-01-15T08:00:00-05:00", jan, false},
		{"2026-01-15 08:00:00-05:00", jan, false},
		{"2026-01-15T08:00-05:00", jan, false},
		{"2026-01-15T24:00", time.Time{}, true},
		{"2026-01-15T07:60", time.Time{}, true},
		{"2026-01-15", time.Time{}, true},
		{"2026-01-15T7:00", time.Time{}, true},
		{"15.01.2026 07:00", time.Time{}, true},
	}
	for _, tt := range tests {
		t.Run(tt.in, func(t *testing.T) {
			got, err := parseDateTime(tt.in, loc)
			if (err != nil) != tt.wantErr || !got.Equal(tt.want) {
				t.Fatalf("parseDateTime(%q) = %v, %v; want %v, error %v", tt.in, got, err, tt.want, tt.wantErr)
			}
			if err == nil && got.Location() != loc {
				t.Errorf("parseDateTime(%q) is in %v, want the facility's zone", tt.in, got.Location())
			}
		})
	}
	// An offset that crosses midnight lands on the facility's local day.
	got, err := parseDateTime("2026-01-16T03:00:00Z", loc)
	if err != nil || DayOf(got) != MakeDay(2026, 1, 15) {
		t.Errorf("03:00Z on Jan 16 = %v (day %v), want Jan 15 in Winnipeg", got, DayOf(got))
	}
}

func TestParseList(t *testing.T) {
	tests := []struct {
		in   string
		want []string
	}{
		{"coverall", []string{"coverall"}},
		{"coverall;boots", []string{"coverall", "boots"}},
		{" coverall ; boots ;", []string{"coverall", "boots"}},
		{";;", []string{}},
	}
	for _, tt := range tests {
		t.Run(tt.in, func(t *testing.T) {
			got := parseList(tt.in, func(s string) string { return s })
			if d := cmp.Diff(tt.want, got); d != "" {
				t.Errorf("parseList(%q) (-want +got):\n%s", tt.in, d)
			}
		})
	}
}

func TestIDAndCode(t *testing.T) {
	long := "A123456789012345678901234567890123456789012345678901234567890123" // 64 characters
	tests := []struct {
		in           string
		isID, isCode bool
	}{
		{"A1", true, false},
		{"fox-07.b:2/x_y", true, false},
		{long, true, false},
		{long + "4", false, false},
		{"", false, false},
		{"A 1", false, false},
		{"Ä1", false, false},
		{"vulpes_vulpes", true, true},
		{"co2_chamber", true, true},
		{"Captive_Bolt", true, false},
		{"2nd_method", true, false},
		{"captive-bolt", true, false},
	}
	for _, tt := range tests {
		t.Run(tt.in, func(t *testing.T) {
			if got := isID(tt.in); got != tt.isID {
				t.Errorf("isID(%q) = %v, want %v", tt.in, got, tt.isID)
			}
			if got := IsCode(tt.in); got != tt.isCode {
				t.Errorf("IsCode(%q) = %v, want %v", tt.in, got, tt.isCode)
			}
		})
	}
}

// TestUnitConversions checks every unit alternative against NIST SP 811
// (2008 edition), Appendix B.8 "Factors for units listed alphabetically".
func TestUnitConversions(t *testing.T) {
	tests := []struct {
		kind   unitKind
		suffix string
		in     float64
		want   float64
	}{
		{"temperature", "_c", -40, -40},
		{"temperature", "_f", -40, -40},  // SP 811 B.8: t/°C = (t/°F − 32)/1.8; −40 °F = −40 °C
		{"temperature", "_f", 32, 0},     // SP 811 B.8: freezing point of water
		{"temperature", "_f", 212, 100},  // SP 811 B.8: boiling point of water at 1 atm
		{"temperature", "_f", -130, -90}, // (−130 − 32)/1.8 = −90
		{"speed", "_kmh", 25, 25},
		{"speed", "_mph", 1, 1.609344},  // SP 811 B.8: 1 mi/h = 1.609344 km/h (exact)
		{"speed", "_mph", 15, 24.14016}, // 15 × 1.609344
		{"speed", "_ms", 1, 3.6},        // SP 811 B.8: 1 km/h = 0.2777778 m/s, i.e. 1 m/s = 3.6 km/h
		{"speed", "_ms", 10, 36},
		{"length", "_cm", 70, 70},
		{"length", "_in", 1, 2.54},   // SP 811 B.8: 1 in = 2.54 cm (exact)
		{"length", "_in", 24, 60.96}, // 24 × 2.54
		{"area", "_m2", 0.8, 0.8},
		{"area", "_ft2", 1, 0.09290304}, // SP 811 B.8: 1 ft² = 9.290304 E−02 m² (exact)
		{"area", "_ft2", 10, 0.9290304},
		{"mass", "_kg", 6.2, 6.2},
		{"mass", "_lb", 1, 0.45359237},  // SP 811 B.8: 1 lb (avoirdupois) = 0.45359237 kg (exact)
		{"mass", "_lb", 22, 9.97903214}, // 22 × 0.45359237
		{"thickness", "_mm", 2.5, 2.5},
		{"duration", "_min", 15, 15},
		{"grams", "_g", 250, 250},
	}
	for _, tt := range tests {
		t.Run(string(tt.kind)+tt.suffix, func(t *testing.T) {
			var alt *unitAlt
			for i, a := range units[tt.kind] {
				if a.suffix == tt.suffix {
					alt = &units[tt.kind][i]
				}
			}
			if alt == nil {
				t.Fatalf("no %s alternative %s", tt.kind, tt.suffix)
			}
			if got := alt.toSI(tt.in); math.Abs(got-tt.want) > 1e-9 {
				t.Errorf("%v%s = %v, want %v", tt.in, tt.suffix, got, tt.want)
			}
		})
	}
}

// The zone kept for a file's dates gives exactly what time.Date gives (the
// same instant, in the same location, by ==), for every quarter hour of the
// days around each change of offset in zones that shift by an hour (at
// 02:00 or at midnight), by half an hour, or never, read in file order
// (one date after another) and jumping between dates. Offsets and change
// times from the IANA tz database the Go runtime reads.
func TestZoneCacheMatchesTimeDate(t *testing.T) {
	for _, name := range []string{"America/Winnipeg", "America/Havana", "America/Santiago", "Europe/London",
		"Australia/Lord_Howe", "Asia/Kathmandu", "UTC"} {
		loc, err := time.LoadLocation(name)
		if err != nil {
			t.Fatalf("zone %s: %v", name, err)
		}
		var z zoneCache
		check := func(y, mo, d, h, mi int) {
			t.Helper()
			got, want := z.date(y, mo, d, h, mi, 0, loc), time.Date(y, time.Month(mo), d, h, mi, 0, 0, loc)
			if got != want {
				t.Fatalf("%s %04d-%02d-%02d %02d:%02d: %v, time.Date gives %v", name, y, mo, d, h, mi, got, want)
			}
			if z.dayOf(want) != DayOf(want) {
				t.Fatalf("%s %v: day %v, DayOf gives %v", name, want, z.dayOf(want), DayOf(want))
			}
		}
		days := 0
		for day := time.Date(2025, 1, 1, 0, 0, 0, 0, time.UTC); day.Year() < 2027; day = day.AddDate(0, 0, 1) {
			// Days whose local midnight and next midnight differ in offset, and their neighbours.
			_, o1 := time.Date(day.Year(), day.Month(), day.Day(), 0, 0, 0, 0, loc).Zone()
			_, o2 := time.Date(day.Year(), day.Month(), day.Day()+1, 0, 0, 0, 0, loc).Zone()
			if o1 == o2 && day.Day() != 15 {
				continue
			}
			days++
			for _, dd := range []int{-1, 0, 1} {
				c := day.AddDate(0, 0, dd)
				for m := 0; m < 24*60; m += 15 {
					check(c.Year(), int(c.Month()), c.Day(), m/60, m%60)
					// A jump to another date and back.
					check(2026, 7, 1, 12, 0)
				}
			}
		}
		if days == 0 {
			t.Fatalf("%s: no days checked", name)
		}
	}
}

// A number within its validate range skips the validator; the range must
// say what the validator says, at each bound, just inside and outside it,
// for every range tag the record types carry (and a tag that is more than a
// range is not taken as one).
func TestNumRangeMatchesValidator(t *testing.T) {
	for _, tag := range []string{"gt=0,lte=5000", "gte=-80,lte=60", "gte=0,lte=100", "gt=0,lte=100", "gte=0",
		"gte=1,lte=5", "gt=0,lt=60", "lt=-1"} {
		r, ok := rangeOf(tag)
		if !ok {
			t.Fatalf("%s: not read as a range", tag)
		}
		for _, v := range []float64{-1e300, -81, -80, -79.999, -1, -0.5, 0, 5e-324, 0.5, 1, 4.999, 5, 5.001, 59.99, 60, 60.01,
			99.9, 100, 100.0001, 4999, 5000, 5000.5, 1e300} {
			valid := validate().Var(v, tag) == nil
			if got := r.holds(v); got != valid {
				t.Errorf("%s, %v: range says %v, validator says %v", tag, v, got, valid)
			}
			p := v
			if validP := validate().Var(&p, tag) == nil; validP != valid {
				t.Errorf("%s, %v: the validator differs on a pointer", tag, v)
			}
		}
	}
	for _, tag := range []string{"", "required,gte=0", "gte=0,dive", "oneof=1 2", "gte=x"} {
		if _, ok := rangeOf(tag); ok {
			t.Errorf("%q read as a range", tag)
		}
	}
}

// Whole numbers are read without ParseFloat; they must come out as
// ParseFloat reads them (a sign, a point or an exponent takes the long way).
func TestParseNumberWholeMatchesParseFloat(t *testing.T) {
	for _, s := range []string{"0", "00", "007", "250", "10000", "999999999999999", "9007199254740993", "-0", "-5", "+5", "1e3", "2.5", "1_000", "0x10", ""} {
		got, ok := parseNumber(s)
		want, err := strconv.ParseFloat(s, 64)
		wantOK := err == nil && !strings.ContainsAny(s, "_xX")
		if ok != wantOK || (ok && math.Float64bits(got) != math.Float64bits(want)) {
			t.Errorf("parseNumber(%q) = %v, %v; ParseFloat gives %v (%v)", s, got, ok, want, err)
		}
	}
}
