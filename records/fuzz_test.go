package records

import (
	"bytes"
	"context"
	"encoding/csv"
	"errors"
	"io"
	"math"
	"strings"
	"testing"
	"testing/fstest"
	"time"
)

// The fuzz targets below run their seeds as ordinary tests; fuzz one with
// `go test ./records -run '^$' -fuzz '^FuzzLoadCSV$' -fuzztime 60s`.
// Crashers found are kept in testdata/fuzz/<target>/ and run as seeds.

// fuzzFiles are the files FuzzLoadCSV writes its input into.
var fuzzFiles = []string{careFile, animalsFile, enclosuresFile, housingFile, staffFile, protocolsFile,
	handlingFile, ppeFile, weatherFile, workFile, cullsFile}

var fuzzNow = func() time.Time { return time.Date(2026, 3, 1, 12, 0, 0, 0, time.UTC) }

// FuzzLoadCSV loads an in-memory folder whose one record file is the input.
// Properties: no panic; per file read = accepted + rejected, the accepted
// rows are the rows in the set; every problem names its file and is
// positioned (a line, or the file marked unusable as a whole); each
// rejected row of a usable file has its own problem.
func FuzzLoadCSV(f *testing.F) {
	f.Add(uint8(0), []byte(hostileCareHead+"2026-01-15T07:00,E1,K1,yes,ok\n"))
	f.Add(uint8(0), []byte(hostileCareHead+"2026-01-15T08:00,E1,K1,yes,\"gate\nleft\"\n2026-01-15T09:00,E1,K1,yes,\"open\n"))
	f.Add(uint8(0), []byte("checked_at,enclosure_id,staff_id,observed,water\r\n2026-01-15T07:00,E1,K1,yes,frozn\r\n,,,,\r\n"))
	f.Add(uint8(0), []byte("\ufeffdate,building_id,staff_id,observed,notes\n2026-01-15,S1,K1,y,caf\xe9\n2026-01-16,S1,K\x001,n,\n"))
	f.Add(uint8(1), []byte(baseFiles[animalsFile]+"A1,vulpes_vulpes,f,1926-04-20,2024-04-20,E1,6.2,68\n"))
	f.Add(uint8(2), []byte(baseFiles[enclosuresFile]+"E3,S1,cage,47_in,39.4,,80,yes,yes\n"))
	f.Add(uint8(3), []byte("animal_id,enclosure_id,moved_in_on,moved_out_on\nA1,E1,2024-04-20,2024-04-20\nA2,E2,2024-09-01,\n"))
	f.Add(uint8(4), []byte(baseFiles[staffFile]+"K1,Dup,keeper,,\n"))
	f.Add(uint8(5), []byte("protocol_id,title,approved_on,expires_on\nP1,\"Winter, housing\",2025-06-01,2028-05-31\n"))
	f.Add(uint8(8), []byte("observed_at,site_id,air_temp_f,wind_mph\n2026-01-15T07:00-06:00,MAST,-40,12.5\n2026-01-15 08:00,MAST,1e400,NaN\n"))
	f.Add(uint8(9), []byte("staff_id,started_at,ended_at,site_id\nK1,2026-01-15T09:00,2026-01-15T08:00,MAST\n"))
	f.Fuzz(func(t *testing.T, which uint8, data []byte) {
		name := fuzzFiles[int(which)%len(fuzzFiles)]
		fsys := folder(nil)
		fsys[name] = &fstest.MapFile{Data: data}
		opt := testSpecies
		opt.Now = fuzzNow
		s, err := Load(fsys, opt)
		if err != nil {
			var le *LoadError
			if !errors.As(err, &le) || le.File == "" {
				t.Fatalf("folder error %v is not a positioned LoadError", err)
			}
			return
		}
		checkSet(t, s, bytes.Count(data, []byte{'\n'})+1)
	})
}

// checkSet asserts the accounting and positioning properties of a load.
func checkSet(t *testing.T, s *Set, maxLine int) {
	t.Helper()
	lens := map[string]int{
		animalsFile: len(s.Animals), enclosuresFile: len(s.Enclosures), housingFile: len(s.Housing),
		staffFile: len(s.Staff), protocolsFile: len(s.Protocols), careFile: s.CareRounds().Len(),
		handlingFile: len(s.Handling), ppeFile: len(s.PPEChecks), weatherFile: len(s.Weather),
		workFile: len(s.Work), cullsFile: len(s.Culls),
	}
	failed := map[string]bool{}
	rowProblems := map[string]int{}
	for _, c := range s.Accounting {
		if c.Read != c.Accepted+c.Rejected || c.Read < 0 || c.Accepted < 0 || c.Rejected < 0 {
			t.Errorf("%s: read %d != accepted %d + rejected %d", c.File, c.Read, c.Accepted, c.Rejected)
		}
		if c.Accepted != lens[c.File] {
			t.Errorf("%s: accepted %d but the set holds %d rows", c.File, c.Accepted, lens[c.File])
		}
		failed[c.File] = c.Failed != ""
	}
	for _, p := range s.Problems {
		if p.File == "" || p.Reason == "" {
			t.Errorf("problem without a file or reason: %+v", p)
		}
		if p.Line <= 0 && !failed[p.File] {
			t.Errorf("problem not positioned, in a file still used: %v", p)
		}
		if p.Line > maxLine && p.File != animalsFile && p.File != enclosuresFile && p.File != staffFile {
			t.Errorf("problem on line %d of a %d-line file: %v", p.Line, maxLine, p)
		}
		if len(p.Reason) > 1000 || len(p.Value) > 200 {
			t.Errorf("problem echoes %d bytes of reason, %d of value", len(p.Reason), len(p.Value))
		}
		if p.Line > 1 {
			rowProblems[p.File]++
		}
	}
	for _, c := range s.Accounting {
		if c.Failed == "" && rowProblems[c.File] != c.Rejected {
			t.Errorf("%s: %d rejected rows but %d row problems", c.File, c.Rejected, rowProblems[c.File])
		}
	}
}

// FuzzCSVReader: on any input encoding/csv reads without error, the loader's
// reader gives the same records at the same lines. On any input it does not
// panic, and every row error is positioned.
func FuzzCSVReader(f *testing.F) {
	for _, s := range []string{
		"a,b,c\n1,2,3\n", "a,\"b\nc\",d\r\n\n\ne,f\r", "\"a\"\"b\",c\n", "a,\"b\n", "a,b\"c\n", "\"a\"b,c\n",
		",\n,,\n", "\"\"\n\"\n\"\n", "x\r\ny\rz\n", "a,\"\r\n\"\r\n",
	} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		want := csv.NewReader(bytes.NewReader(data))
		want.FieldsPerRecord = -1
		r := newCSVReader(bytes.NewReader(data))
		agree := true
		for i := 0; ; i++ {
			rec, err := r.Read()
			if agree {
				wrec, werr := want.Read()
				switch {
				case werr != nil && werr != io.EOF:
					agree = false // encoding/csv stops agreeing at its first error
				case (werr == io.EOF) != (err == io.EOF):
					t.Fatalf("record %d: encoding/csv says %v, ours %v (%q)", i, werr, err, rec)
				case werr == nil && err != nil:
					t.Fatalf("record %d: encoding/csv reads %q, ours fails: %v", i, wrec, err)
				case werr == nil && strings.Join(wrec, "\x1f") != strings.Join(rec, "\x1f"):
					t.Fatalf("record %d: encoding/csv reads %q, ours %q", i, wrec, rec)
				case werr == nil:
					if line, _ := want.FieldPos(0); line != r.start {
						t.Fatalf("record %d: encoding/csv starts it on line %d, ours on %d", i, line, r.start)
					}
				}
			}
			if err == io.EOF {
				return
			}
			if err != nil {
				var pe *csv.ParseError
				if !errors.As(err, &pe) {
					if len(data) <= MaxLineBytes {
						t.Fatalf("fatal error on a small input: %v", err)
					}
					return
				}
				if pe.StartLine < 1 || pe.StartLine > r.numLine {
					t.Fatalf("row error at line %d of %d read: %v", pe.StartLine, r.numLine, err)
				}
				continue
			}
			if r.start < 1 || r.end < r.start {
				t.Fatalf("record %q at lines %d–%d", rec, r.start, r.end)
			}
			if i > len(data)+1 {
				t.Fatalf("more records than bytes: the reader does not progress")
			}
		}
	})
}

func FuzzParseDate(f *testing.F) {
	for _, s := range []string{"2026-01-15", "2024-02-29", "2023-02-29", "0000-01-01", "9999-12-31", "2026-1-15", "2026-01-15T07:00", "２０２６-01-15"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		d, err := parseDate(s)
		if err != nil {
			if !strings.Contains(err.Error(), "is not a date") {
				t.Fatalf("error %q does not say what is wrong", err)
			}
			return
		}
		if d.String() != s {
			t.Fatalf("parseDate(%q) = %s: does not round-trip", s, d)
		}
		if tt, err := time.Parse("2006-01-02", s); err == nil && DayOf(tt) != d {
			t.Fatalf("parseDate(%q) = %s, time.Parse gives %s", s, d, DayOf(tt))
		}
	})
}

func FuzzParseDateTime(f *testing.F) {
	for _, s := range []string{"2026-01-15T07:00", "2026-01-15 07:00:30", "2026-01-15T07:00:00-06:00", "2026-01-15T07:00Z",
		"2026-03-08T02:30", "2026-01-15T24:00", "2026-01-15T07:00:00.123456789+14:00", "2026-01-15T07:00:60"} {
		f.Add(s)
	}
	loc, err := time.LoadLocation("America/Winnipeg")
	if err != nil {
		f.Fatal(err)
	}
	f.Fuzz(func(t *testing.T, s string) {
		tm, err := parseDateTime(s, loc)
		if err != nil {
			if !strings.Contains(err.Error(), "is not a date-time") {
				t.Fatalf("error %q does not say what is wrong", err)
			}
			return
		}
		if tm.Location() != loc {
			t.Fatalf("parseDateTime(%q) is in %v, not the facility's zone", s, tm.Location())
		}
		if y := tm.Year(); y < -1 || y > 10000 {
			t.Fatalf("parseDateTime(%q) = %v", s, tm)
		}
		if len(s) > 19 { // written with an offset: the instant does not depend on the facility's zone
			if ut, err := parseDateTime(s, time.UTC); err != nil || !ut.Equal(tm) {
				t.Fatalf("parseDateTime(%q) with an offset depends on the zone: %v vs %v (%v)", s, ut, tm, err)
			}
		}
	})
}

// FuzzNumberWithUnit: a number that reads is finite and bounded, written in
// digits, and stays finite in every unit it may be written in.
func FuzzNumberWithUnit(f *testing.F) {
	for _, s := range []string{"-40", "12.5", "1e300", "1e301", "NaN", "Inf", "0x1p3", "1_000", "12,5", "+.5", "-", "."} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		v, ok := parseNumber(s)
		if !ok {
			return
		}
		if math.IsNaN(v) || math.IsInf(v, 0) || math.Abs(v) > 1e300 {
			t.Fatalf("parseNumber(%q) = %v", s, v)
		}
		if strings.ContainsAny(s, "xXpP_nNiI, ") {
			t.Fatalf("parseNumber(%q) read a form a keeper's record does not use", s)
		}
		for _, alts := range units {
			for _, a := range alts {
				if si := a.toSI(v); math.IsNaN(si) || math.IsInf(si, 0) {
					t.Fatalf("%q %s converts to %v", s, a.label, si)
				}
			}
		}
	})
}

func FuzzParseBool(f *testing.F) {
	for _, s := range []string{"yes", "No", "Y", "n", "TRUE", "false", "1", "0", "ja", "yess", ""} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		b, ok := parseBool(s)
		want := map[string]Bool{"yes": Yes, "y": Yes, "true": Yes, "1": Yes, "no": No, "n": No, "false": No, "0": No}
		w, known := want[strings.ToLower(s)]
		if strings.ToLower(s) != string(bytes.ToLower([]byte(s))) || len(strings.ToLower(s)) != len(s) {
			known = false // a case mapping that changes length is not one of the words
		}
		if ok != known || (ok && b != w) {
			t.Fatalf("parseBool(%q) = %v, %v; want %v, %v", s, b, ok, w, known)
		}
	})
}

func FuzzParseList(f *testing.F) {
	for _, s := range []string{"a;b", " a ; ;b ", ";;", "captive_bolt;barbiturate_overdose", "a\u00a0;b"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		got := parseList(s, func(v string) string { return v })
		if len(got) > strings.Count(s, ";")+1 {
			t.Fatalf("parseList(%q) = %q: more parts than separators allow", s, got)
		}
		for _, v := range got {
			if v == "" || v != strings.TrimSpace(v) || strings.Contains(v, ";") {
				t.Fatalf("parseList(%q) has part %q", s, v)
			}
		}
	})
}

// FuzzIDAndCode: ids and codes are exactly the forms records.md gives.
func FuzzIDAndCode(f *testing.F) {
	for _, s := range []string{"F1", "E-12/3", "", strings.Repeat("a", 65), "snake_case", "Snake", "1abc", "a b", "é"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		id := len(s) >= 1 && len(s) <= 64
		for _, c := range []byte(s) {
			id = id && (c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || strings.IndexByte("-_.:/", c) >= 0)
		}
		if isID(s) != id {
			t.Fatalf("isID(%q) = %v", s, isID(s))
		}
		code := len(s) >= 1 && s[0] >= 'a' && s[0] <= 'z'
		for _, c := range []byte(s) {
			code = code && (c >= 'a' && c <= 'z' || c >= '0' && c <= '9' || c == '_')
		}
		if IsCode(s) != code {
			t.Fatalf("IsCode(%q) = %v", s, IsCode(s))
		}
	})
}

// FuzzFacilityYAML: facility.yaml either loads with a time zone or fails
// with a LoadError naming the file.
func FuzzFacilityYAML(f *testing.F) {
	f.Add([]byte(baseFiles[facilityFile]))
	f.Add([]byte("name: X\ntime_zone: Local\n"))
	f.Add([]byte("name: X\ntime_zone: America/Winnipeg\nbuildings:\n  - id: S1\n  - id: S1\n"))
	f.Add([]byte("name: &a [*a]\n"))
	f.Add([]byte("a: &a [*a,*a,*a,*a,*a,*a,*a,*a,*a]\nb: &b [*a,*a,*a,*a,*a,*a,*a,*a,*a]\nc: &c [*b,*b,*b,*b,*b,*b,*b,*b,*b]\n"))
	f.Add([]byte("name: X\ntime_zone: America/Winnipeg\nunknown: 1\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		fac, loc, err := loadFacility(context.Background(), fstest.MapFS{facilityFile: {Data: data}})
		if err != nil {
			var le *LoadError
			if !errors.As(err, &le) || le.File != facilityFile || le.Reason == "" {
				t.Fatalf("error %v is not a LoadError of %s", err, facilityFile)
			}
			return
		}
		if loc == nil || fac.Name == "" {
			t.Fatalf("loaded %+v with location %v", fac, loc)
		}
	})
}

// FuzzParseRef: a ref parses back into the place it was made of.
func FuzzParseRef(f *testing.F) {
	for _, s := range []string{"daily_care.csv:212", "facility.yaml:7", "a:b:3", ":3", "x:", "x:0", "x:01", "x:-1", "x:99999999999",
		"records.xlsx:daily_care!212", "records.xlsx:daily_care!E4", "x.xlsx:!5", "x.xlsx:s!XFE4", "x.xlsx:s!E"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		p, err := ParseRef(s)
		if err != nil {
			return
		}
		if p.File == "" || p.Line < 1 || (p.Column != "" && p.Sheet == "") {
			t.Fatalf("ParseRef(%q) = %+v", s, p)
		}
		if got := string(p.Ref()); got != s {
			t.Fatalf("ParseRef(%q) = %+v, which makes %q", s, p, got)
		}
	})
}

// TestRefRoundTrip: the loader's refs parse back to their file and line.
func TestRefRoundTrip(t *testing.T) {
	s := mustLoad(t, folder(nil))
	for _, a := range s.Animals {
		p, err := ParseRef(string(a.Ref))
		if err != nil || p.File != animalsFile || p.Sheet != "" || MakeRef(p.File, p.Line) != a.Ref {
			t.Errorf("ParseRef(%q) = %+v, %v", a.Ref, p, err)
		}
	}
}
