package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"
	"unicode/utf8"

	"github.com/google/go-cmp/cmp"

	"welfare/reports"
)

const (
	oneCage     = "../../testdata/today/records" // a one-cage station with every record file
	goldenToday = "../../testdata/golden/today"
)

// The keepers' view on the demo's days: byte for byte, within one screen
// (24 lines of 80 columns), with the exit code that is its answer.
func TestGoldenToday(t *testing.T) {
	tests := []struct {
		name string
		args []string
		code int
	}{
		// 2026-01-10 is the demo's coldest wind chill (-50 at 06:00); 07:00
		// is before the first round, so feeding, observation and water are
		// due later, not problems.
		{"cold-2026-01-10-0700", []string{"today", demoRecords, "--on", "2026-01-10", "--at", "07:00"}, exitFindings},
		{"cold-2026-01-10-0700-plain", []string{"today", demoRecords, "--on", "2026-01-10", "--at", "07:00", "--plain"}, exitFindings},
		// 2026-01-09 at 10:00: the first round is done, the second water
		// check is due by 16:00.
		{"cold-2026-01-09-1000", []string{"today", demoRecords, "--on", "2026-01-09", "--at", "10:00"}, exitFindings},
		// A mild day: 2026-01-29, the only demo day above 0 °C at its lowest.
		{"mild-2026-01-29-1200", []string{"today", demoRecords, "--on", "2026-01-29", "--at", "12:00"}, exitFindings},
		// 2026-02-01 is after the demo's records: no rounds and no reading.
		// At 06:00 the rounds are due later; at 18:00 they are missing.
		{"no-rounds-2026-02-01-0600", []string{"today", demoRecords, "--on", "2026-02-01", "--at", "06:00"}, exitFindings},
		{"no-rounds-2026-02-01-1800", []string{"today", demoRecords, "--on", "2026-02-01", "--at", "18:00"}, exitFindings},
		// The summer demo's hottest day, after the afternoon peak.
		{"hot-2026-07-16-1700", []string{"today", summerRecords, "--on", "2026-07-16", "--at", "17:00"}, exitFindings},
		// The same view through check --on.
		{"check-on-2026-01-10-0700", []string{"check", demoRecords, "--on", "2026-01-10", "--at", "07:00"}, exitFindings},
		// A station with nothing wrong: all clear with the second water
		// check due later, and all clear once it is done.
		{"allclear-2026-03-10-1000", []string{"today", oneCage, "--on", "2026-03-10", "--at", "10:00"}, exitOK},
		{"allclear-2026-03-10-1800", []string{"today", oneCage, "--on", "2026-03-10", "--at", "18:00"}, exitOK},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			code, stdout, stderr := runMain(t, tc.args...)
			if code != tc.code {
				t.Errorf("exit %d, want %d\n%s%s", code, tc.code, stdout, stderr)
			}
			checkScreen(t, stdout)
			goldenFile(t, filepath.Join(goldenToday, tc.name+".txt"), stdout)
		})
	}
}

// checkScreen asserts the view fits one screen.
func checkScreen(t *testing.T, out string) {
	t.Helper()
	lines := strings.Split(strings.TrimSuffix(out, "\n"), "\n")
	if len(lines) > reports.TodayMaxLines {
		t.Errorf("%d lines, more than a screen's %d:\n%s", len(lines), reports.TodayMaxLines, out)
	}
	for i, l := range lines {
		if n := utf8.RuneCountInString(l); n > reports.TodayMaxCols {
			t.Errorf("line %d has %d columns, more than %d: %q", i+1, n, reports.TodayMaxCols, l)
		}
		if strings.ContainsAny(l, "\x1b") {
			t.Errorf("line %d holds a terminal escape: %q", i+1, l)
		}
	}
}

func goldenFile(t *testing.T, path, got string) {
	t.Helper()
	if *update {
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run: go test ./cmd/welfare -run GoldenToday -update)", err)
	}
	if diff := cmp.Diff(string(want), got); diff != "" {
		t.Errorf("%s (-want +got):\n%s", path, diff)
	}
}

// --plain draws no boxes.
func TestTodayPlain(t *testing.T) {
	_, stdout, _ := runMain(t, "today", demoRecords, "--on", "2026-01-10", "--at", "07:00", "--plain")
	if strings.ContainsAny(stdout, "─│┌┐└┘├┤") {
		t.Errorf("--plain output draws boxes:\n%s", stdout)
	}
}

// "Today" is the facility's day, by an injected clock: 13:00 UTC on
// 2026-01-10 is 07:00 in Winnipeg (UTC-6 in January, tz database).
func TestTodayClock(t *testing.T) {
	saved := clock
	t.Cleanup(func() { clock = saved })
	clock = func() time.Time { return time.Date(2026, 1, 10, 13, 0, 0, 0, time.UTC) }
	_, want, _ := runMain(t, "today", demoRecords, "--on", "2026-01-10", "--at", "07:00")
	tests := []struct {
		name string
		args []string
		want string
	}{
		{"today by default", []string{"today", demoRecords}, want},
		{"--on today", []string{"today", demoRecords, "--on", "today"}, want},
		{"check --on alone", []string{"check", demoRecords, "--on"}, want},
		{"check --on today", []string{"check", demoRecords, "--on", "today"}, want},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			code, got, stderr := runMain(t, tc.args...)
			if code != exitFindings {
				t.Errorf("exit %d, want %d\n%s", code, exitFindings, stderr)
			}
			if d := cmp.Diff(tc.want, got); d != "" {
				t.Errorf("(-want +got):\n%s", d)
			}
		})
	}
	// Yesterday is 2026-01-09, seen whole (its day is over).
	_, wantY, _ := runMain(t, "today", demoRecords, "--on", "2026-01-09")
	if _, got, _ := runMain(t, "today", demoRecords, "--on", "yesterday"); got != wantY {
		t.Errorf("--on yesterday (-want +got):\n%s", cmp.Diff(wantY, got))
	}
	if !strings.Contains(wantY, "end of day") {
		t.Errorf("a past day without --at is not read to its end:\n%s", wantY)
	}
	// Just after midnight UTC it is still the evening before in Winnipeg.
	clock = func() time.Time { return time.Date(2026, 1, 11, 3, 0, 0, 0, time.UTC) }
	_, got, _ := runMain(t, "today", demoRecords)
	if !strings.HasPrefix(got, "Birchfall Fur Research Station: Sat 2026-01-10, at 21:00 (America/Winnipeg)") {
		t.Errorf("03:00 UTC on the 11th is not 21:00 on the 10th in Winnipeg:\n%s", got)
	}
}

func TestTodayUsageErrors(t *testing.T) {
	tests := []struct {
		args []string
		want string
	}{
		{[]string{"today", demoRecords, "--on", "tomorow"}, `--on: `},
		{[]string{"today", demoRecords, "--at", "7am"}, `--at: "7am" is not a time of day (HH:MM, 24-hour, such as 08:00)`},
		{[]string{"today", demoRecords, "--at", "24:00"}, `--at: "24:00" is not a time of day`},
		{[]string{"check", demoRecords, "--at", "07:00"}, "--at and --plain go with --on (the morning view)"},
		{[]string{"today"}, "one records folder"},
	}
	for _, tc := range tests {
		t.Run(strings.Join(tc.args, " "), func(t *testing.T) {
			code, _, stderr := runMain(t, tc.args...)
			if code != exitUsage || !strings.Contains(stderr, tc.want) {
				t.Errorf("exit %d, stderr %q; want exit 2 saying %q", code, stderr, tc.want)
			}
		})
	}
}

// The second round's water check is due later at 10:00 and missing at
// 18:00 when the afternoon round is not recorded: the one-cage station
// without its 15:30 round.
func TestTodaySecondRoundMissed(t *testing.T) {
	dir := t.TempDir()
	entries, err := os.ReadDir(oneCage)
	if err != nil {
		t.Fatal(err)
	}
	for _, e := range entries {
		b, err := os.ReadFile(filepath.Join(oneCage, e.Name()))
		if err != nil {
			t.Fatal(err)
		}
		if e.Name() == "daily_care.csv" {
			var keep []string
			for _, l := range strings.SplitAfter(string(b), "\n") {
				if !strings.HasPrefix(l, "2026-03-10T15:30") {
					keep = append(keep, l)
				}
			}
			b = []byte(strings.Join(keep, ""))
		}
		if err := os.WriteFile(filepath.Join(dir, e.Name()), b, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	tests := []struct {
		at   string
		code int
		want string
	}{
		{"10:00", exitOK, "  by 16:00: check water (freezing day) (1): S1-01\n"},
		{"15:59", exitOK, "  by 16:00: check water (freezing day) (1): S1-01\n"},
		{"16:00", exitFindings, "  S1-01: Too few water checks on a freezing day\n"},
		{"18:00", exitFindings, "  S1-01: Too few water checks on a freezing day\n"},
	}
	for _, tc := range tests {
		t.Run(tc.at, func(t *testing.T) {
			code, stdout, stderr := runMain(t, "today", dir, "--on", "2026-03-10", "--at", tc.at)
			if code != tc.code || !strings.Contains(stdout, tc.want) {
				t.Errorf("exit %d (want %d), view lacks %q:\n%s%s", code, tc.code, tc.want, stdout, stderr)
			}
			checkScreen(t, stdout)
		})
	}
}
