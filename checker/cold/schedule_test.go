package cold

import (
	"bytes"
	"errors"
	"fmt"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/rules"
)

// shipped builds the schedule from the limits.yaml the binary ships, so the
// tests below check that file against the published table.
func shipped(t testing.TB) *Schedule {
	t.Helper()
	l, err := rules.LoadLimits(bytes.NewReader(rules.DefaultLimits()), "limits.yaml")
	if err != nil {
		t.Fatalf("LoadLimits(shipped): %v", err)
	}
	s, err := NewSchedule(l.Cold.WorkWarmup)
	if err != nil {
		t.Fatalf("NewSchedule(shipped): %v", err)
	}
	return s
}

// answer is the part of a Step the published table fixes.
type answer struct {
	Kind       Kind
	MaxWorkMin int
	Breaks     int
}

func (a answer) String() string {
	if a.Kind == Limit {
		return fmt.Sprintf("%d/%d", a.MaxWorkMin, a.Breaks)
	}
	return a.Kind.String()
}

var (
	nrm = answer{Kind: NoLimit}
	ces = answer{Kind: Cease}
)

func lim(mins, breaks int) answer { return answer{Kind: Limit, MaxWorkMin: mins, Breaks: breaks} }

// acgih is the ACGIH TLV work/warm-up schedule for a 4-hour shift
// (Saskatchewan Labour, "Cold Conditions Guidelines for Outside Workers",
// as reprinted by CCOHS; ACGIH TLV booklet, cold stress), typed here from
// the published table independently of limits.yaml. Moderate to heavy
// work; columns: no noticeable wind, 8, 16, 24, 32 km/h.
var acgih = []struct {
	warmest, coldest int // air °C, inclusive; coldest of the last row is open
	cells            [5]answer
}{
	{-26, -28, [5]answer{nrm, nrm, lim(75, 2), lim(55, 3), lim(40, 4)}},        // ACGIH/Saskatchewan: −26 to −28 °C: N N 75/2 55/3 40/4
	{-29, -31, [5]answer{nrm, lim(75, 2), lim(55, 3), lim(40, 4), lim(30, 5)}}, // ACGIH/Saskatchewan: −29 to −31 °C: N 75/2 55/3 40/4 30/5
	{-32, -34, [5]answer{lim(75, 2), lim(55, 3), lim(40, 4), lim(30, 5), ces}}, // ACGIH/Saskatchewan: −32 to −34 °C: 75/2 55/3 40/4 30/5 C
	{-35, -37, [5]answer{lim(55, 3), lim(40, 4), lim(30, 5), ces, ces}},        // ACGIH/Saskatchewan: −35 to −37 °C: 55/3 40/4 30/5 C C
	{-38, -39, [5]answer{lim(40, 4), lim(30, 5), ces, ces, ces}},               // ACGIH/Saskatchewan: −38 to −39 °C: 40/4 30/5 C C C
	{-40, -42, [5]answer{lim(30, 5), ces, ces, ces, ces}},                      // ACGIH/Saskatchewan: −40 to −42 °C: 30/5 C C C C
	{-43, -60, [5]answer{ces, ces, ces, ces, ces}},                             // ACGIH/Saskatchewan: −43 °C and below: C C C C C
}

// acgihWinds are the column heads (km/h) of the published table.
var acgihWinds = [5]float64{0, 8, 16, 24, 32} // ACGIH/Saskatchewan column heads: no noticeable wind, 8, 16, 24, 32 km/h

// windsFor gives winds that must fall in column j: its head, and for the
// columns after the first, a wind just above the previous head.
func windsFor(j int) []float64 {
	if j == 0 {
		return []float64{0}
	}
	return []float64{acgihWinds[j-1] + 0.1, acgihWinds[j]}
}

// Every cell of the published table, at every whole degree of each row and
// at winds at both ends of each column, for moderate work (and heavy and
// empty, which the table treats alike) and for light work (the next row
// colder, as the published table directs).
func TestLookupPublishedTable(t *testing.T) {
	s := shipped(t)
	for i, row := range acgih {
		for temp := row.warmest; temp >= row.coldest; temp-- {
			for j := range acgihWinds {
				for _, wind := range windsFor(j) {
					for _, act := range []string{"moderate", "heavy", "", "light"} {
						want := row.cells[j]
						if act == "light" && i+1 < len(acgih) {
							want = acgih[i+1].cells[j]
						}
						name := fmt.Sprintf("%dC/%gkmh/%s", temp, wind, act)
						t.Run(name, func(t *testing.T) {
							st := s.Lookup(float64(temp), wind, act)
							got := answer{st.Kind, st.MaxWorkMin, st.Breaks}
							if diff := cmp.Diff(want, got); diff != "" {
								t.Errorf("Lookup(%d, %g, %q) (-want +got):\n%s", temp, wind, act, diff)
							}
							if st.ColumnKmh != acgihWinds[j] {
								t.Errorf("column %g km/h, want %g", st.ColumnKmh, acgihWinds[j])
							}
						})
					}
				}
			}
		}
	}
}

func TestLookupCases(t *testing.T) {
	s := shipped(t)
	tests := []struct {
		name      string
		airC, kmh float64
		activity  string
		want      Step
	}{
		{
			// The schedule's published example (references.md, corrected): −35 °C, no
			// noticeable wind, work with little physical movement → one step lower →
			// 40 min, 4 breaks (Saskatchewan Labour "Cold Conditions Guidelines for
			// Outside Workers"; ACGIH TLV booklet, cold stress).
			name: "published example (light work)", airC: -35, kmh: 0, activity: "light",
			want: Step{Kind: Limit, MaxWorkMin: 40, Breaks: 4, AirRowC: -35, Row: 4, RowWarmestC: -38, Shifted: true, Column: 0, ColumnKmh: 0, Cell: "40/4"},
		},
		{
			// Same source: the moderate-work cell for the same conditions is 55/3.
			name: "published example's moderate-work cell", airC: -35, kmh: 0, activity: "moderate",
			want: Step{Kind: Limit, MaxWorkMin: 55, Breaks: 3, AirRowC: -35, Row: 3, RowWarmestC: -35, Column: 0, ColumnKmh: 0, Cell: "55/3"},
		},
		{
			// Same table, 8 km/h column at −35 °C, moderate work: 40/4 (a table
			// cell, not the published example).
			name: "8 km/h at -35 moderate", airC: -35, kmh: 8, activity: "moderate",
			want: Step{Kind: Limit, MaxWorkMin: 40, Breaks: 4, AirRowC: -35, Row: 3, RowWarmestC: -35, Column: 1, ColumnKmh: 8, Cell: "40/4"},
		},
		{
			// Same conditions, light work: the next row colder (−38 to −39)
			// → 30/5 (same table, light-work note).
			name: "8 km/h at -35 light work", airC: -35, kmh: 8, activity: "light",
			want: Step{Kind: Limit, MaxWorkMin: 30, Breaks: 5, AirRowC: -35, Row: 4, RowWarmestC: -38, Shifted: true, Column: 1, ColumnKmh: 8, Cell: "30/5"},
		},
		{
			// Light work at the coldest row stays there (nothing is colder).
			name: "light at coldest row", airC: -50, kmh: 0, activity: "light",
			want: Step{Kind: Cease, AirRowC: -50, Row: 6, RowWarmestC: -43, Column: 0, ColumnKmh: 0, Cell: "C"},
		},
		{
			// Wind exactly on a column head uses that column: −32 °C row,
			// 8 km/h → 55/3 (ACGIH/Saskatchewan table).
			name: "wind exactly 8", airC: -32, kmh: 8,
			want: Step{Kind: Limit, MaxWorkMin: 55, Breaks: 3, AirRowC: -32, Row: 2, RowWarmestC: -32, Column: 1, ColumnKmh: 8, Cell: "55/3"},
		},
		{
			// Just above a head uses the next column: 16 km/h → 40/4.
			name: "wind 8.1 uses 16", airC: -32, kmh: 8.1,
			want: Step{Kind: Limit, MaxWorkMin: 40, Breaks: 4, AirRowC: -32, Row: 2, RowWarmestC: -32, Column: 2, ColumnKmh: 16, Cell: "40/4"},
		},
		{
			// Above the last column uses the last: 32 km/h at −32 → C.
			name: "wind 40 uses 32", airC: -32, kmh: 40,
			want: Step{Kind: Cease, AirRowC: -32, Row: 2, RowWarmestC: -32, Column: 4, ColumnKmh: 32, Cell: "C"},
		},
		{
			name: "negative wind uses the first column", airC: -32, kmh: -1,
			want: Step{Kind: Limit, MaxWorkMin: 75, Breaks: 2, AirRowC: -32, Row: 2, RowWarmestC: -32, Column: 0, ColumnKmh: 0, Cell: "75/2"},
		},
		{
			// Rounded down: −25.5 °C is the −26 row; 32 km/h → 40/4.
			name: "-25.5 rounds down to -26", airC: -25.5, kmh: 32,
			want: Step{Kind: Limit, MaxWorkMin: 40, Breaks: 4, AirRowC: -26, Row: 0, RowWarmestC: -26, Column: 4, ColumnKmh: 32, Cell: "40/4"},
		},
		{
			// Rounded down, not to nearest: −25.2 °C is still the −26 row.
			name: "-25.2 rounds down to -26", airC: -25.2, kmh: 32,
			want: Step{Kind: Limit, MaxWorkMin: 40, Breaks: 4, AirRowC: -26, Row: 0, RowWarmestC: -26, Column: 4, ColumnKmh: 32, Cell: "40/4"},
		},
		{
			// −28.2 °C rounds down to −29: the −29 to −31 row, 8 km/h → 75/2
			// (ACGIH/Saskatchewan table), where −28 would give N.
			name: "-28.2 rounds down to -29", airC: -28.2, kmh: 8,
			want: Step{Kind: Limit, MaxWorkMin: 75, Breaks: 2, AirRowC: -29, Row: 1, RowWarmestC: -29, Column: 1, ColumnKmh: 8, Cell: "75/2"},
		},
		{
			// The table starts at −26 °C: −25 °C has no limit from it,
			// even for light work in a strong wind.
			name: "-25 no limit", airC: -25, kmh: 50, activity: "light",
			want: Step{Kind: NoLimit, AirRowC: -25, Row: -1, Column: 4, ColumnKmh: 32},
		},
		{
			// "N" cells are normal breaks: no limit, but the row is named.
			name: "N cell", airC: -27, kmh: 5,
			want: Step{Kind: NoLimit, AirRowC: -27, Row: 0, RowWarmestC: -26, Column: 1, ColumnKmh: 8, Cell: "N"},
		},
		{
			// An activity the table does not know is read as light (the
			// stricter row), never as no limit.
			name: "unknown activity is light", airC: -35, kmh: 8, activity: "Light",
			want: Step{Kind: Limit, MaxWorkMin: 30, Breaks: 5, AirRowC: -35, Row: 4, RowWarmestC: -38, Shifted: true, Column: 1, ColumnKmh: 8, Cell: "30/5"},
		},
		{
			name: "NaN air", airC: math.NaN(), kmh: 8,
			want: Step{Kind: Unknown, Row: -1, Column: -1},
		},
		{
			name: "NaN wind", airC: -35, kmh: math.NaN(),
			want: Step{Kind: Unknown, AirRowC: -35, Row: -1, Column: -1},
		},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := s.Lookup(tc.airC, tc.kmh, tc.activity)
			// AirRowC is NaN for a NaN air temperature; compare it apart.
			if math.IsNaN(tc.airC) {
				if !math.IsNaN(got.AirRowC) {
					t.Errorf("AirRowC = %g, want NaN", got.AirRowC)
				}
				got.AirRowC = 0
			}
			if diff := cmp.Diff(tc.want, got); diff != "" {
				t.Errorf("Lookup(%g, %g, %q) (-want +got):\n%s", tc.airC, tc.kmh, tc.activity, diff)
			}
		})
	}
}

func TestStepString(t *testing.T) {
	s := shipped(t)
	tests := []struct {
		name string
		step Step
		want string
	}{
		{"limit", s.Lookup(-35, 8, ""), "max 40 min work, 4 warm-up breaks (row -35 °C, 8 km/h column)"},
		{"light", s.Lookup(-35, 8, "light"), "max 30 min work, 5 warm-up breaks (row -38 °C, 8 km/h column, one row colder for light work)"},
		{"cease", s.Lookup(-45, 0, ""), "non-emergency work should cease (row -43 °C, 0 km/h column)"},
		{"warm", s.Lookup(-20, 30, ""), "normal breaks (-20 °C is warmer than the schedule)"},
		{"unknown", Step{}, "no schedule lookup (air temperature or wind unknown)"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if diff := cmp.Diff(tc.want, tc.step.String()); diff != "" {
				t.Errorf("(-want +got):\n%s", diff)
			}
		})
	}
}

func TestNewScheduleErrors(t *testing.T) {
	good := func() rules.WorkWarmup {
		return rules.WorkWarmup{
			WindColumnsKmh: []float64{0, 8},
			Rows: []rules.WarmupRow{
				{WarmestC: -26, Cells: []string{"N", "75/2"}},
				{WarmestC: -29, Cells: []string{"40/4", "C"}},
			},
		}
	}
	tests := []struct {
		name    string
		edit    func(w *rules.WorkWarmup)
		wantKey string
	}{
		{"no columns", func(w *rules.WorkWarmup) { w.WindColumnsKmh = nil }, "cold.work_warmup.wind_columns_kmh"},
		{"no rows", func(w *rules.WorkWarmup) { w.Rows = nil }, "cold.work_warmup.rows"},
		{"columns fall", func(w *rules.WorkWarmup) { w.WindColumnsKmh = []float64{8, 0} }, "cold.work_warmup.wind_columns_kmh[1]"},
		{"column NaN", func(w *rules.WorkWarmup) { w.WindColumnsKmh[1] = math.NaN() }, "cold.work_warmup.wind_columns_kmh[1]"},
		{"rows not warmest first", func(w *rules.WorkWarmup) { w.Rows[1].WarmestC = -20 }, "cold.work_warmup.rows[1].warmest_c"},
		{"row NaN", func(w *rules.WorkWarmup) { w.Rows[0].WarmestC = math.NaN() }, "cold.work_warmup.rows[0].warmest_c"},
		{"too few cells", func(w *rules.WorkWarmup) { w.Rows[1].Cells = []string{"C"} }, "cold.work_warmup.rows[1].cells"},
		{"dash cell", func(w *rules.WorkWarmup) { w.Rows[0].Cells[1] = "75-2" }, "cold.work_warmup.rows[0].cells[1]"},
		{"zero minutes", func(w *rules.WorkWarmup) { w.Rows[0].Cells[1] = "0/2" }, "cold.work_warmup.rows[0].cells[1]"},
		{"negative breaks", func(w *rules.WorkWarmup) { w.Rows[0].Cells[1] = "75/-2" }, "cold.work_warmup.rows[0].cells[1]"},
		{"word cell", func(w *rules.WorkWarmup) { w.Rows[1].Cells[0] = "cease" }, "cold.work_warmup.rows[1].cells[0]"},
		{"lower-case n", func(w *rules.WorkWarmup) { w.Rows[0].Cells[0] = "n" }, "cold.work_warmup.rows[0].cells[0]"},
	}
	if _, err := NewSchedule(good()); err != nil {
		t.Fatalf("NewSchedule(good) = %v", err)
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			w := good()
			tc.edit(&w)
			s, err := NewSchedule(w)
			var se *ScheduleError
			if !errors.As(err, &se) {
				t.Fatalf("NewSchedule = %v, %v; want a *ScheduleError", s, err)
			}
			if diff := cmp.Diff(tc.wantKey, se.Key); diff != "" {
				t.Errorf("key (-want +got):\n%s", diff)
			}
			if se.Reason == "" {
				t.Error("empty reason")
			}
		})
	}
}

// The schedule keeps its own copy: editing the limits afterwards must not
// change answers already being given.
func TestNewScheduleCopies(t *testing.T) {
	w := rules.WorkWarmup{WindColumnsKmh: []float64{0, 8}, Rows: []rules.WarmupRow{{WarmestC: -26, Cells: []string{"N", "75/2"}}}}
	s, err := NewSchedule(w)
	if err != nil {
		t.Fatal(err)
	}
	w.WindColumnsKmh[1] = 100
	if got := s.Lookup(-30, 8, "").ColumnKmh; got != 8 {
		t.Errorf("column after editing the input = %g, want 8", got)
	}
}

func BenchmarkLookup(b *testing.B) {
	s := shipped(b)
	b.Run("7x5", func(b *testing.B) {
		var sink int
		for i := 0; b.Loop(); i++ {
			sink += s.Lookup(-24-float64(i&31), float64(i&63), "light").MaxWorkMin
		}
		_ = sink
	})
}
