package records

import (
	"fmt"
	"testing"
	"testing/fstest"
	"time"

	"github.com/google/go-cmp/cmp"
)

func feed(v float64) *float64 { return &v }

// sameRounds compares rounds field by field, times by instant and by
// location, and the store's view and ref of each against the row.
func sameRounds(t *testing.T, c *CareRounds, want []CareRound) {
	t.Helper()
	got := c.Rounds()
	if d := cmp.Diff(want, got); d != "" {
		t.Fatalf("rounds (-want +got):\n%s", d)
	}
	for i := range want {
		w := &want[i]
		if got[i].At.Location() != w.At.Location() {
			t.Errorf("row %d: At in %v, want %v", i, got[i].At.Location(), w.At.Location())
		}
		if c.Ref(i) != w.Ref || c.Day(i) != w.Day {
			t.Errorf("row %d: Ref %q Day %v, want %q %v", i, c.Ref(i), c.Day(i), w.Ref, w.Day)
		}
		v := c.View(i)
		hasFeed := w.FeedG != nil
		var g float64
		if hasFeed {
			g = *w.FeedG
		}
		wantView := CareView{At: w.At, Day: w.Day, DateOnly: w.DateOnly, EnclosureID: w.EnclosureID, BuildingID: w.BuildingID,
			StaffID: w.StaffID, Observed: w.Observed, Fed: w.Fed, FeedG: g, HasFeed: hasFeed, Water: w.Water,
			WaterRestored: w.WaterRestored, BeddingAdded: w.BeddingAdded, Cleaned: w.Cleaned, HealthConcern: w.HealthConcern,
			ConcernAnimalID: w.ConcernAnimalID, Notes: w.Notes}
		if d := cmp.Diff(wantView, v); d != "" {
			t.Errorf("row %d: view (-want +got):\n%s", i, d)
		}
		wantAnswers := CareAnswers{Observed: w.Observed, Fed: w.Fed, WaterRestored: w.WaterRestored,
			BeddingAdded: w.BeddingAdded, Cleaned: w.Cleaned, HealthConcern: w.HealthConcern, Water: w.Water,
			FeedG: g, HasFeed: hasFeed}
		if d := cmp.Diff(wantAnswers, c.Answers(i)); d != "" {
			t.Errorf("row %d: answers (-want +got):\n%s", i, d)
		}
		k, strs := c.Keys(i), c.Strings()
		if got := [4]string{strs[k.Enclosure], strs[k.Building], strs[k.Staff], strs[k.ConcernAnimal]}; got != [4]string{w.EnclosureID, w.BuildingID, w.StaffID, w.ConcernAnimalID} {
			t.Errorf("row %d: keys name %q, want %q", i, got, [4]string{w.EnclosureID, w.BuildingID, w.StaffID, w.ConcernAnimalID})
		}
	}
}

// Every field comes back as it went in: each Bool field in each of its
// three states, each water state, a feed absent, zero and fractional,
// notes with commas, line breaks and non-ASCII text, date-only rows, refs
// of CSV files and workbooks, and rows the compact form cannot hold (a
// time with a fraction of a second or in another zone, a zero time, a
// yes/no or water value outside the records contract).
func TestCareRoundsRoundTrip(t *testing.T) {
	loc, err := time.LoadLocation("America/Winnipeg")
	if err != nil {
		t.Fatal(err)
	}
	at := func(d, h, m int) time.Time { return time.Date(2026, 1, d, h, m, 0, 0, loc) }
	var rows []CareRound
	line := 2
	add := func(r CareRound) {
		if r.Ref == "" {
			r.Ref = MakeRef("daily_care.csv", line)
		}
		if r.At.IsZero() && !r.DateOnly {
			r.At = at(10, 7, line%60)
		}
		if r.Day == 0 {
			r.Day = DayOf(r.At)
		}
		if r.StaffID == "" {
			r.StaffID = "K1"
		}
		rows = append(rows, r)
		line++
	}
	bools := []Bool{NotRecorded, No, Yes}
	for _, b := range bools {
		add(CareRound{EnclosureID: "E1", Observed: b})
		add(CareRound{EnclosureID: "E1", Fed: b})
		add(CareRound{EnclosureID: "E1", WaterRestored: b})
		add(CareRound{EnclosureID: "E1", BeddingAdded: b})
		add(CareRound{EnclosureID: "E1", Cleaned: b})
		add(CareRound{EnclosureID: "E1", HealthConcern: b, ConcernAnimalID: "A7"})
	}
	// Every field set at once, to distinct values, so a field read from
	// the wrong bits shows.
	add(CareRound{EnclosureID: "E2", BuildingID: "S1", StaffID: "K2", Observed: Yes, Fed: No, FeedG: feed(312.5), Water: "low",
		WaterRestored: NotRecorded, BeddingAdded: Yes, Cleaned: No, HealthConcern: Yes, ConcernAnimalID: "A9", Notes: "limping, left hind"})
	for _, w := range waterStates {
		add(CareRound{EnclosureID: "E1", Water: w})
	}
	add(CareRound{EnclosureID: "E1", FeedG: feed(0)})
	add(CareRound{EnclosureID: "E1", FeedG: feed(0.1 + 0.2)})
	add(CareRound{EnclosureID: "E1", FeedG: feed(453.59237 * 1.1)}) // 1.1 lb in grams
	add(CareRound{EnclosureID: "E1", Notes: "ice in bowl, broken\nand refilled"})
	add(CareRound{EnclosureID: "E1", Notes: "søvnig — «stille»"})
	add(CareRound{BuildingID: "S1", DateOnly: true, At: MakeDay(2026, 1, 11).In(loc), Day: MakeDay(2026, 1, 11)})
	add(CareRound{Ref: "records.xlsx:daily_care!4", EnclosureID: "E1"})
	add(CareRound{Ref: "daily_care.xlsx:Sheet1!1048576", EnclosureID: "E1"})
	add(CareRound{Ref: "records.xlsx:daily_care!E4", EnclosureID: "E1"})
	for _, ref := range []Ref{"", "by hand", "x:0", "x:007", "x:1234567890", "9"} {
		add(CareRound{Ref: ref, EnclosureID: "E1"})
	}
	// Kept whole.
	add(CareRound{EnclosureID: "E1", At: at(12, 7, 0).Add(500 * time.Millisecond)})
	add(CareRound{EnclosureID: "E1", At: at(12, 7, 0).UTC()})
	add(CareRound{EnclosureID: "E1", Observed: Bool(7), FeedG: feed(5)})
	odd := len(rows) - 1
	add(CareRound{EnclosureID: "E1", Water: "slushy"})
	add(CareRound{EnclosureID: "E1", Observed: Yes})                              // compact again after the whole ones
	add(CareRound{EnclosureID: "E1", At: time.Time{}, Day: MakeDay(2026, 1, 12)}) // no time: compact

	c := NewCareRounds(rows, loc)
	if c.Len() != len(rows) {
		t.Fatalf("Len = %d, want %d", c.Len(), len(rows))
	}
	sameRounds(t, c, rows)
	if n := len(c.wide); n != 4 {
		t.Errorf("%d rows kept whole, want the 4 the compact form cannot hold", n)
	}
	// Round gives a feed of its own: changing it does not change the store.
	if r := c.Round(odd); r.FeedG == nil || *r.FeedG != 5 {
		t.Fatalf("feed of a whole row = %v", r.FeedG)
	} else {
		*r.FeedG = 6
		if *c.Round(odd).FeedG != 5 {
			t.Error("Round shares the feed of a row kept whole")
		}
	}
}

func TestCareRoundsViewDoesNotAllocate(t *testing.T) {
	loc := time.FixedZone("station", -6*3600)
	c := NewCareRounds([]CareRound{{Ref: "daily_care.csv:2", At: time.Date(2026, 1, 10, 7, 0, 0, 0, loc), Day: MakeDay(2026, 1, 10),
		EnclosureID: "E1", StaffID: "K1", FeedG: feed(200), Water: "ok", Notes: "fine"}}, loc)
	var sink CareView
	if n := testing.AllocsPerRun(100, func() { sink = c.View(0) }); n != 0 {
		t.Errorf("View allocates %v times a call", n)
	}
	if n := testing.AllocsPerRun(100, func() { _ = c.CompareRefs(0, 0) }); n != 0 {
		t.Errorf("CompareRefs allocates %v times a call", n)
	}
	if sink.Notes != "fine" {
		t.Errorf("view = %+v", sink)
	}
}

// Rows at the edges of blocks (0, the last of a block, the first and
// second of the next) are where an index off by one would show.
func TestCareRoundsBlockEdges(t *testing.T) {
	loc := time.UTC
	n := 2*careBlockSize + 2
	rows := make([]CareRound, n)
	start := time.Date(2025, 1, 1, 7, 0, 0, 0, loc)
	for i := range rows {
		at := start.Add(time.Duration(i) * time.Hour)
		rows[i] = CareRound{Ref: MakeRef("daily_care.csv", i+2), At: at, Day: DayOf(at), EnclosureID: fmt.Sprintf("E%d", i%37),
			StaffID: fmt.Sprintf("K%d", i%5), Observed: Bool(i % 3), Water: waterStates[i%len(waterStates)]}
		if i%4 == 0 {
			rows[i].FeedG = feed(float64(i) / 4)
		}
	}
	c := NewCareRounds(rows, loc)
	if c.Len() != n || len(c.blocks) != 3 {
		t.Fatalf("Len %d in %d blocks; want %d in 3", c.Len(), len(c.blocks), n)
	}
	for _, i := range []int{0, careBlockSize - 1, careBlockSize, careBlockSize + 1, 2 * careBlockSize, n - 1} {
		if d := cmp.Diff(rows[i], c.Round(i)); d != "" {
			t.Errorf("row %d (-want +got):\n%s", i, d)
		}
	}
	sameRounds(t, c, rows)

	// Filter and retain keep the chosen rows in order, across blocks.
	odd := func(i int) bool { return i%2 == 1 }
	var want []CareRound
	for i := range rows {
		if odd(i) {
			want = append(want, rows[i])
		}
	}
	sameRounds(t, c.Filter(odd), want)
	sameRounds(t, c, rows) // Filter leaves the store as it is
	c.retain(odd)
	sameRounds(t, c, want)
	if len(c.blocks) != 2 {
		t.Errorf("%d blocks after dropping half of %d rows, want 2", len(c.blocks), n)
	}
	c.retain(func(i int) bool { return i < careBlockSize })
	if c.Len() != careBlockSize || len(c.blocks) != 1 {
		t.Errorf("Len %d in %d blocks, want one full block", c.Len(), len(c.blocks))
	}
	sameRounds(t, c, want[:careBlockSize])
}

// The loader fills the store from a CSV file and from a workbook: every
// column read, refs that name the sheet, the committee's x_ columns kept
// by ref, and a row failing a cross-record rule rejected as before.
func TestLoadedCareRounds(t *testing.T) {
	csvFile := "checked_at,date,enclosure_id,building_id,staff_id,observed,fed,feed_g,water,water_restored,bedding_added,cleaned,health_concern,concern_animal_id,notes,x_round\n" +
		"2026-01-15T07:30,,E1,,K1,yes,no,0,frozen,yes,no,,yes,A1,\"ice, broken\",am\n" +
		",2026-01-16,,S1,K1,no,,,,,,yes,,,,pm\n" +
		"2026-01-16T16:00,,E1,,K1,yes,yes,212.5,ok,,,,,,,\n" +
		"2026-01-17T07:00,,E9,,K1,yes,,,,,,,,,,\n"
	s := mustLoad(t, folder(map[string]string{careFile: csvFile}))
	loc := s.Location
	want := []CareRound{
		{Ref: "daily_care.csv:2", At: time.Date(2026, 1, 15, 7, 30, 0, 0, loc), Day: MakeDay(2026, 1, 15), EnclosureID: "E1", StaffID: "K1",
			Observed: Yes, Fed: No, FeedG: feed(0), Water: "frozen", WaterRestored: Yes, BeddingAdded: No, HealthConcern: Yes, ConcernAnimalID: "A1", Notes: "ice, broken"},
		{Ref: "daily_care.csv:3", At: time.Date(2026, 1, 16, 0, 0, 0, 0, loc), Day: MakeDay(2026, 1, 16), DateOnly: true, BuildingID: "S1", StaffID: "K1",
			Observed: No, Cleaned: Yes},
		{Ref: "daily_care.csv:4", At: time.Date(2026, 1, 16, 16, 0, 0, 0, loc), Day: MakeDay(2026, 1, 16), EnclosureID: "E1", StaffID: "K1",
			Observed: Yes, Fed: Yes, FeedG: feed(212.5), Water: "ok"},
	}
	sameRounds(t, s.CareRounds(), want)
	if len(s.CareRounds().wide) != 0 {
		t.Errorf("loaded rows kept whole: %+v", s.CareRounds().wide)
	}
	if s.Care != nil {
		t.Errorf("Load filled Care as well as the store: %d rows", len(s.Care))
	}
	if d := cmp.Diff(map[Ref]map[string]string{"daily_care.csv:2": {"x_round": "am"}, "daily_care.csv:3": {"x_round": "pm"},
		"daily_care.csv:4": {"x_round": ""}, "daily_care.csv:5": {"x_round": ""}}, s.Extra); d != "" {
		t.Errorf("extra (-want +got):\n%s", d)
	}
	if len(s.Problems) != 1 || s.Problems[0].Line != 5 || s.Problems[0].Column != "enclosure_id" || s.Problems[0].Day != MakeDay(2026, 1, 17) {
		t.Errorf("problems = %+v, want the unknown enclosure on line 5", s.Problems)
	}

	// The same rows as records.xlsx: refs name the workbook and sheet.
	sheetRows := [][]any{{"checked_at", "date", "enclosure_id", "building_id", "staff_id", "observed", "fed", "feed_g", "water", "water_restored", "bedding_added", "cleaned", "health_concern", "concern_animal_id", "notes"},
		{"2026-01-15T07:30", nil, "E1", nil, "K1", "yes", "no", 0.0, "frozen", "yes", "no", nil, "yes", "A1", "ice, broken"},
		{nil, day(2026, 1, 16), nil, "S1", "K1", "no", nil, nil, nil, nil, nil, "yes"},
		{"2026-01-16T16:00", nil, "E1", nil, "K1", "yes", "yes", 212.5, "ok"},
	}
	fsys := folder(nil)
	fsys["records.xlsx"] = &fstest.MapFile{Data: book(t, "daily_care", sheetRows)}
	w, err := Load(fsys, testSpecies)
	if err != nil || len(w.Problems) != 0 {
		t.Fatalf("workbook: %v %v", err, w.Problems)
	}
	for i := range want {
		want[i].Ref = Ref(fmt.Sprintf("records.xlsx:daily_care!%d", i+2))
		want[i].At = want[i].At.In(w.Location)
	}
	sameRounds(t, w.CareRounds(), want)
}

// Until gives the rounds of a loaded set up to a moment, as it does for a
// set made by hand.
func TestUntilLoadedRounds(t *testing.T) {
	s := mustLoad(t, folder(map[string]string{careFile: "checked_at,date,enclosure_id,staff_id,observed\n" +
		"2026-01-10T07:30,,E1,K1,yes\n" +
		"2026-01-10T15:30,,E1,K1,yes\n" +
		",2026-01-10,E1,K1,yes\n" +
		",2026-01-11,E1,K1,yes\n"}))
	u := s.Until(time.Date(2026, 1, 10, 9, 0, 0, 0, s.Location))
	var got []Ref
	for i := range u.CareRounds().Len() {
		got = append(got, u.CareRounds().Ref(i))
	}
	if d := cmp.Diff([]Ref{"daily_care.csv:2", "daily_care.csv:4"}, got); d != "" {
		t.Errorf("kept rounds (-want +got):\n%s", d)
	}
	if s.CareRounds().Len() != 4 {
		t.Errorf("Until changed the set it was given")
	}
}
