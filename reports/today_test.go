package reports_test

import (
	"bytes"
	"context"
	"fmt"
	"slices"
	"strings"
	"testing"
	"testing/fstest"
	"time"
	"unicode/utf8"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/checker/cold"
	"welfare/records"
	"welfare/reports"
	"welfare/rules"
)

func defaultSchedule(t *testing.T) *cold.Schedule {
	t.Helper()
	lim, err := rules.LoadLimits(bytes.NewReader(rules.DefaultLimits()), "limits.yaml")
	if err != nil {
		t.Fatal(err)
	}
	s, err := cold.NewSchedule(lim.Cold.WorkWarmup)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// todayFixture is an invented three-cage yard on 2026-01-13 with rounds due
// at 07:00 and 15:00: N-01 had its 06:50 round (one water check), N-02 none.
func todayFixture() (*records.Set, *checker.Result, records.Day) {
	day := records.MakeDay(2026, 1, 13)
	at := func(h, m int) time.Time { return time.Date(2026, 1, 13, h, m, 0, 0, time.UTC) }
	wind := func(v float64) *float64 { return &v }
	set := &records.Set{
		Facility: records.Facility{Name: "Birchfall Fur Research Station", TimeZone: "UTC",
			WeatherSites: []string{"YARD"}, RoundTimes: records.RoundTimes{First: "07:00", Second: "15:00"}},
		Location:   time.UTC,
		Enclosures: []records.Enclosure{{ID: "N-01", BuildingID: "N"}, {ID: "N-02", BuildingID: "N"}, {ID: "N-03", BuildingID: "N"}},
		Care:       []records.CareRound{{At: at(6, 50), Day: day, EnclosureID: "N-01", Observed: records.Yes, Water: "ok"}},
		Weather: []records.Weather{
			{At: at(3, 0), SiteID: "YARD", AirTempC: -40, WindKmh: wind(10)},
			{At: at(6, 0), SiteID: "YARD", AirTempC: -36.5, WindKmh: wind(5)},
		},
	}
	f := func(check, subject, title string, on records.Day) checker.Finding {
		return checker.Finding{Check: check, Subject: subject, Title: title, On: on, Severity: checker.Minor}
	}
	r := &checker.Result{
		Facility: "Birchfall Fur Research Station",
		Findings: []checker.Finding{
			f("care.observation.missed", "N-02", "Animals not observed", day),
			f("cold.water.checks_insufficient", "N-01", "Too few water checks on a freezing day", day),
			f("cold.water.checks_insufficient", "N-02", "Too few water checks on a freezing day", day),
			f("enclosure.nest_box.missing", "N-03", "Nest box missing", day-3),
			f("care.observation.missed", "N-01", "Animals not observed", day-1), // yesterday: not today's
		},
	}
	r.Findings[3].Until = day
	return set, r, day
}

// A round check is due later until its round's time; then it is a problem.
func TestWriteTodayRounds(t *testing.T) {
	tests := []struct {
		name     string
		at       int
		endOfDay bool
		later    []string
		problems int
	}{
		{name: "before the first round", at: 6 * 60, problems: 1, later: []string{
			"  by 07:00: observe the animals (1): N-02",
			"  by 07:00: check water (freezing day) (1): N-02", // no check yet: its first is due first
			"  by 15:00: check water (freezing day) (1): N-01", // one check done: the second is due
		}},
		{name: "at the first round", at: 7 * 60, problems: 3, later: []string{
			"  by 15:00: check water (freezing day) (1): N-01",
		}},
		{name: "at the second round", at: 15 * 60, problems: 4},
		{name: "end of day", endOfDay: true, problems: 4},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			set, r, day := todayFixture()
			var b bytes.Buffer
			v, err := reports.WriteToday(&b, r, reports.TodayOptions{Day: day, At: tc.at, EndOfDay: tc.endOfDay,
				Records: set, Schedule: defaultSchedule(t), AllCommand: "welfare check yard --from 2026-01-13 --to 2026-01-13"})
			if err != nil {
				t.Fatal(err)
			}
			var later []string
			for _, l := range strings.Split(b.String(), "\n") {
				if strings.HasPrefix(l, "  by ") {
					later = append(later, l)
				}
			}
			if d := cmp.Diff(tc.later, later); d != "" {
				t.Errorf("due later (-want +got):\n%s\n%s", d, b.String())
			}
			if v.Problems != tc.problems || v.AllClear() {
				t.Errorf("verdict %+v, want %d problems and no all-clear", v, tc.problems)
			}
		})
	}
}

// The weather lines against published tables.
func TestWriteTodayWeather(t *testing.T) {
	set, r, day := todayFixture()
	var b bytes.Buffer
	if _, err := reports.WriteToday(&b, r, reports.TodayOptions{Day: day, At: 6 * 60, Records: set, Schedule: defaultSchedule(t), Plain: true}); err != nil {
		t.Fatal(err)
	}
	got := strings.Split(b.String(), "\n")[1:6]
	want := []string{
		"Weather so far:",
		// Environment Canada wind chill table: −40 °C air, 10 km/h → −51;
		// ECCC hazard band −48 to −54: exposed skin can freeze in 2–5 min.
		"  YARD: coldest wind chill -51 °C at 03:00 (air -40 °C, wind 10 km/h)",
		"    wind chill band: exposed skin can freeze in 2–5 min",
		"    latest 06:00: air -36.5 °C, wind 5 km/h; work/warm-up schedule:",
		// ACGIH TLV work/warm-up schedule, row −35 to −37 °C, 5 mph (8 km/h)
		// column: 40 min, 4 breaks; light work one row colder (−38 to −39
		// °C): 30 min, 5 breaks.
		"    moderate: 40-minute stints, 4 warm-up breaks; light: 30/5",
	}
	if d := cmp.Diff(want, got); d != "" {
		t.Errorf("weather (-want +got):\n%s", d)
	}
}

// A freezing day whose readings have no wind: the view says the wind-chill
// checks wait for it and gives no all-clear; once one reading has wind the
// line gives way to the coldest wind chill.
func TestWriteTodayNoWindYet(t *testing.T) {
	const noWind = "  YARD: no reading with wind yet today (air down to -40 °C)"
	wind := func(v float64) *float64 { return &v }
	tests := []struct {
		name     string
		winds    [2]*float64 // of the 03:00 (−40 °C) and 06:00 (−36.5 °C) readings
		want     string      // the site's first weather line
		missing  bool        // "no weather reading with wind today at YARD" among the reasons
		notWants string
	}{
		{"no reading has wind", [2]*float64{nil, nil}, noWind, true, ""},
		// Environment Canada wind chill formula, −36.5 °C air, 5 km/h:
		// 13.12 + 0.6215·T − 11.37·V^0.16 + 0.3965·T·V^0.16 = −43.0.
		{"one reading has wind", [2]*float64{nil, wind(5)},
			"  YARD: coldest wind chill -43 °C at 06:00 (air -36.5 °C, wind 5 km/h)", false, noWind},
		{"calm is a wind of 0 km/h, not a missing one", [2]*float64{wind(0), nil},
			"  YARD: coldest wind chill -40 °C at 03:00 (air -40 °C, wind 0 km/h)", false, noWind},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			set, _, day := todayFixture()
			set.Weather[0].WindKmh, set.Weather[1].WindKmh = tc.winds[0], tc.winds[1]
			r := &checker.Result{Facility: "Birchfall Fur Research Station"}
			var b bytes.Buffer
			v, err := reports.WriteToday(&b, r, reports.TodayOptions{Day: day, At: 6 * 60, Records: set, Plain: true})
			if err != nil {
				t.Fatal(err)
			}
			lines := strings.Split(b.String(), "\n")
			if len(lines) < 3 || lines[1] != "Weather so far:" || lines[2] != tc.want {
				t.Errorf("weather lines, want %q after the heading:\n%s", tc.want, b.String())
			}
			if tc.missing && (len(lines) < 4 || lines[3] != "    record the wind: the wind-chill checks wait for it") {
				t.Errorf("no line saying what to do after %q:\n%s", tc.want, b.String())
			}
			if strings.Contains(b.String(), "…") {
				t.Errorf("a line is cut at the screen's edge:\n%s", b.String())
			}
			if tc.notWants != "" && strings.Contains(b.String(), tc.notWants) {
				t.Errorf("view says %q:\n%s", tc.notWants, b.String())
			}
			if got := slices.Contains(v.Missing, "no weather reading with wind today at YARD"); got != tc.missing {
				t.Errorf("missing = %q; want the wind reason %v", v.Missing, tc.missing)
			}
			if tc.missing && v.AllClear() {
				t.Error("an all-clear without a reading with wind")
			}
		})
	}
}

// No reading yet and checks that could not run: no all-clear, saying why.
func TestWriteTodayNoAllClear(t *testing.T) {
	set, _, day := todayFixture()
	set.Weather = nil
	r := &checker.Result{Facility: "Birchfall Fur Research Station",
		NotEvaluated: []checker.Skipped{{Check: "care.cleaning.overdue", Reason: "no daily_care.csv in the records folder"}}}
	var b bytes.Buffer
	v, err := reports.WriteToday(&b, r, reports.TodayOptions{Day: day, At: 6 * 60, Records: set})
	if err != nil {
		t.Fatal(err)
	}
	want := []string{"no weather reading today at YARD", "1 check could not run without daily_care.csv"}
	if d := cmp.Diff(want, v.Missing); d != "" || v.AllClear() {
		t.Errorf("missing (-want +got):\n%s", d)
	}
	if !strings.Contains(b.String(), "No all-clear can be given: ") {
		t.Errorf("view does not say why there is no all-clear:\n%s", b.String())
	}
}

// A check whose METADATA says it is judged over a review period
// (custom.period: review) does not hold back a keeper's all-clear when it
// cannot run: the shipped follow-up checks (correction.*) and a committee's
// own rule with the flag alike. A committee rule without the flag still does.
func TestWriteTodayLeavesOutReviewPeriodChecks(t *testing.T) {
	ctx := context.Background()
	lim, err := rules.ParseLimits("limits.yaml (built in)", rules.DefaultLimits())
	if err != nil {
		t.Fatal(err)
	}
	rule := func(id, extra string) string {
		return "# METADATA\n# title: " + id + "\n# description: A committee check under test.\n# custom:\n" +
			"#   id: " + id + "\n#   severity: minor\n#   source: facility choice\n" + extra +
			"findings contains f if {\n\tinput.id == \"never\"\n\tf := {\"check\": \"" + id +
			"\", \"subject\": input.id, \"on\": \"2026-01-13\", \"message\": \"m\", \"evidence\": []}\n}\n\n"
	}
	local := fstest.MapFS{"audit.rego": {Data: []byte("# METADATA\n# title: Committee audit\n# description: Test rules.\n" +
		"# scope: package\n# custom:\n#   subjects: [enclosure]\npackage welfare.audit\n\n" +
		rule("audit.logbook.unsigned", "#   needs: [logbook.csv]\n#   period: review\n") +
		rule("audit.gate.unlocked", "#   needs: [gates.csv]\n"))}}
	policy, err := checker.Compile(ctx, lim, []checker.Source{{Name: "rules", FS: rules.FS()},
		{Name: "ours", FS: local, Local: true}}, checker.Options{})
	if err != nil {
		t.Fatal(err)
	}
	periods := map[string]string{}
	for _, c := range policy.Checks() {
		periods[c.ID] = c.Period
	}
	for _, id := range []string{"correction.overdue", "correction.recurred", "correction.plan.missing", "audit.logbook.unsigned"} {
		if periods[id] != checker.PeriodReview {
			t.Errorf("check %s: period %q, want %q", id, periods[id], checker.PeriodReview)
		}
	}
	if p := periods["audit.gate.unlocked"]; p != "" {
		t.Errorf("check audit.gate.unlocked: period %q, want none", p)
	}

	set, _, day := todayFixture()
	r := &checker.Result{Facility: "Birchfall Fur Research Station", Checks: policy.Checks(),
		NotEvaluated: []checker.Skipped{
			{Check: "correction.overdue", Reason: "no corrective_actions.csv in the records folder"},
			{Check: "audit.logbook.unsigned", Reason: "no logbook.csv in the records folder"},
		}}
	view := func() reports.TodayVerdict {
		t.Helper()
		var b bytes.Buffer
		v, err := reports.WriteToday(&b, r, reports.TodayOptions{Day: day, At: 6 * 60, Records: set})
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	for _, m := range view().Missing {
		if strings.Contains(m, "could not run") {
			t.Errorf("a review-period check holds back the all-clear: %q", m)
		}
	}
	r.NotEvaluated = append(r.NotEvaluated, checker.Skipped{Check: "audit.gate.unlocked", Reason: "no gates.csv in the records folder"})
	if got := view().Missing; !slices.Contains(got, "1 check could not run without gates.csv") {
		t.Errorf("missing = %q, want the day check without gates.csv named", got)
	}
}

// However many findings, the view is one screen, and it names the command
// that lists them all.
func TestWriteTodayOneScreen(t *testing.T) {
	set, r, day := todayFixture()
	for i := range 60 {
		r.Findings = append(r.Findings, checker.Finding{Check: fmt.Sprintf("handling.topic%02d.problem", i),
			Subject: fmt.Sprintf("RF-%03d", i), On: day, Severity: checker.Significant,
			Title: "A title long enough to need cutting at the screen's edge, whatever the terminal", Message: "m"})
	}
	const all = "welfare check yard --from 2026-01-13 --to 2026-01-13"
	var b bytes.Buffer
	if _, err := reports.WriteToday(&b, r, reports.TodayOptions{Day: day, At: 6 * 60, Records: set, AllCommand: all}); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSuffix(b.String(), "\n"), "\n")
	if len(lines) > reports.TodayMaxLines {
		t.Errorf("%d lines, more than %d", len(lines), reports.TodayMaxLines)
	}
	for _, l := range lines {
		if utf8.RuneCountInString(l) > reports.TodayMaxCols {
			t.Errorf("line wider than %d: %q", reports.TodayMaxCols, l)
		}
	}
	if !strings.Contains(b.String(), "\n  "+all+"\n") || !strings.Contains(b.String(), "more lines, all shown by:") {
		t.Errorf("no command for the rest:\n%s", b.String())
	}
}
