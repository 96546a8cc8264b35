package cold

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"welfare/rules"
)

// Kind is what the work/warm-up schedule says for a stint.
type Kind int

const (
	// Unknown is the zero Kind: the lookup could not be made (a NaN air
	// temperature or wind). It is never "no limit", so a forgotten Step does
	// not pass as safe.
	Unknown Kind = iota
	// NoLimit: normal breaks; the schedule sets no maximum work period. This
	// is also the answer when the air is warmer than the table's first row.
	NoLimit
	// Limit: work at most MaxWorkMin minutes, with Breaks 10-minute
	// warm-up breaks in the 4-hour shift.
	Limit
	// Cease: non-emergency work should cease.
	Cease
)

// String names the kind for messages.
func (k Kind) String() string {
	switch k {
	case NoLimit:
		return "no limit"
	case Limit:
		return "limit"
	case Cease:
		return "cease"
	}
	return "unknown"
}

// Step is the schedule's answer for one stint, with the row and column used
// so a message can show them.
type Step struct {
	Kind Kind
	// MaxWorkMin and Breaks are set for Limit: the maximum work period in
	// minutes and the number of 10-minute warm-up breaks.
	MaxWorkMin int
	Breaks     int
	// AirRowC is the air temperature rounded down to a whole degree, the
	// value the rows are matched against.
	AirRowC float64
	// Row is the index of the row used in the schedule (after the light-work
	// shift), or -1 when the air was warmer than the first row. RowWarmestC
	// is that row's warmest_c.
	Row         int
	RowWarmestC float64
	// Shifted is true when light work moved the lookup one row colder
	// (false at the coldest row, which has no row below it).
	Shifted bool
	// Column is the index of the wind column used, or -1 for Unknown;
	// ColumnKmh is its head.
	Column    int
	ColumnKmh float64
	// Cell is the cell as written in the schedule ("N", "C", "40/4"); empty
	// when no row was used.
	Cell string
}

// String describes the step for messages, e.g.
// "max 40 min work, 4 warm-up breaks (row -35 °C, 8 km/h column)".
func (s Step) String() string {
	var what string
	switch s.Kind {
	case NoLimit:
		what = "normal breaks"
	case Limit:
		what = fmt.Sprintf("max %d min work, %d warm-up breaks", s.MaxWorkMin, s.Breaks)
	case Cease:
		what = "non-emergency work should cease"
	default:
		return "no schedule lookup (air temperature or wind unknown)"
	}
	if s.Row < 0 {
		return what + fmt.Sprintf(" (%g °C is warmer than the schedule)", s.AirRowC)
	}
	where := fmt.Sprintf("row %g °C, %g km/h column", s.RowWarmestC, s.ColumnKmh)
	if s.Shifted {
		where += ", one row colder for light work"
	}
	return what + " (" + where + ")"
}

// cell is one parsed schedule cell.
type cell struct {
	kind       Kind
	maxWorkMin int
	breaks     int
	text       string
}

// Schedule is a parsed work/warm-up schedule (limits.yaml
// cold.work_warmup). It is read-only after NewSchedule and safe for
// concurrent use.
type Schedule struct {
	winds   []float64
	warmest []float64
	cells   [][]cell
}

// ScheduleError is a problem in a work/warm-up schedule. Key is the limits
// path of the bad value (e.g. "cold.work_warmup.rows[2].cells[4]"), so a
// caller can position it in the limits file.
type ScheduleError struct {
	Key    string
	Reason string
}

// Error is "KEY: REASON"; the caller adds the limits file and line.
func (e *ScheduleError) Error() string { return e.Key + ": " + e.Reason }

const schedKey = "cold.work_warmup"

// NewSchedule parses and checks a work/warm-up schedule. Cells are "N"
// (normal breaks), "C" (non-emergency work should cease) or "MAX/BREAKS"
// (e.g. "40/4": at most 40 minutes of work, 4 ten-minute warm-up breaks).
// Wind columns must rise, rows must run warmest first, and every row must
// have one cell per wind column. rules.LoadLimits already checks most of
// this; NewSchedule checks again because a WorkWarmup can be built in code.
func NewSchedule(w rules.WorkWarmup) (*Schedule, error) {
	if len(w.WindColumnsKmh) == 0 {
		return nil, &ScheduleError{Key: schedKey + ".wind_columns_kmh", Reason: "needs at least one wind column"}
	}
	if len(w.Rows) == 0 {
		return nil, &ScheduleError{Key: schedKey + ".rows", Reason: "needs at least one row"}
	}
	s := &Schedule{
		winds:   append([]float64(nil), w.WindColumnsKmh...),
		warmest: make([]float64, len(w.Rows)),
		cells:   make([][]cell, len(w.Rows)),
	}
	for i, v := range s.winds {
		key := fmt.Sprintf("%s.wind_columns_kmh[%d]", schedKey, i)
		if math.IsNaN(v) || math.IsInf(v, 0) || v < 0 {
			return nil, &ScheduleError{Key: key, Reason: fmt.Sprintf("%g is not a wind speed", v)}
		}
		if i > 0 && v <= s.winds[i-1] {
			return nil, &ScheduleError{Key: key, Reason: "wind columns must rise"}
		}
	}
	for i, row := range w.Rows {
		key := fmt.Sprintf("%s.rows[%d]", schedKey, i)
		if math.IsNaN(row.WarmestC) || math.IsInf(row.WarmestC, 0) {
			return nil, &ScheduleError{Key: key + ".warmest_c", Reason: fmt.Sprintf("%g is not a temperature", row.WarmestC)}
		}
		if i > 0 && row.WarmestC >= s.warmest[i-1] {
			return nil, &ScheduleError{Key: key + ".warmest_c", Reason: "rows must run warmest first"}
		}
		if len(row.Cells) != len(s.winds) {
			return nil, &ScheduleError{Key: key + ".cells", Reason: fmt.Sprintf("row has %d cells for %d wind columns", len(row.Cells), len(s.winds))}
		}
		s.warmest[i] = row.WarmestC
		s.cells[i] = make([]cell, len(row.Cells))
		for j, text := range row.Cells {
			c, err := parseCell(text)
			if err != nil {
				return nil, &ScheduleError{Key: fmt.Sprintf("%s.cells[%d]", key, j), Reason: err.Error()}
			}
			s.cells[i][j] = c
		}
	}
	return s, nil
}

func parseCell(text string) (cell, error) {
	switch text {
	case "N":
		return cell{kind: NoLimit, text: text}, nil
	case "C":
		return cell{kind: Cease, text: text}, nil
	}
	bad := fmt.Errorf("%q is not a schedule cell (N, C or MINUTES/BREAKS such as 40/4)", text)
	a, b, ok := strings.Cut(text, "/")
	if !ok {
		return cell{}, bad
	}
	mins, err1 := strconv.Atoi(a)
	breaks, err2 := strconv.Atoi(b)
	if err1 != nil || err2 != nil || strings.HasPrefix(a, "+") || strings.HasPrefix(b, "+") {
		return cell{}, bad
	}
	if mins < 1 || breaks < 0 {
		return cell{}, fmt.Errorf("%q: the work period must be at least 1 minute and the breaks at least 0", text)
	}
	return cell{kind: Limit, maxWorkMin: mins, breaks: breaks, text: text}, nil
}

// Lookup finds the schedule's answer for a stint in air at airC (°C) with
// wind windKmh (km/h) and the given activity ("light", "moderate", "heavy",
// or empty for moderate).
//
// The air temperature is rounded down to a whole degree; the row used is the
// coldest row whose warmest_c is at or above it. Air warmer than the first
// row has no limit from the table, whatever the activity. The column is the
// first wind column at or above the wind; winds above the last column use
// the last. Light work uses the next row colder (the coldest row stays the
// coldest), as the published schedule directs. The published table is for
// moderate to heavy work, so "heavy" is read as "moderate"; any other
// activity is read as light, the stricter choice, because an unknown
// activity must not loosen a cold-injury limit (records validation rejects
// such rows before they get here).
func (s *Schedule) Lookup(airC, windKmh float64, activity string) Step {
	if math.IsNaN(airC) || math.IsNaN(windKmh) {
		return Step{Kind: Unknown, AirRowC: airC, Row: -1, Column: -1}
	}
	col := len(s.winds) - 1
	for j, v := range s.winds {
		if windKmh <= v {
			col = j
			break
		}
	}
	t := math.Floor(airC)
	st := Step{AirRowC: t, Row: -1, Column: col, ColumnKmh: s.winds[col]}
	if t > s.warmest[0] {
		st.Kind = NoLimit
		return st
	}
	// Rows run warmest first, so the coldest row at or above t is the last
	// one whose warmest_c >= t.
	row := 0
	for i := 1; i < len(s.warmest) && s.warmest[i] >= t; i++ {
		row = i
	}
	switch activity {
	case "", "moderate", "heavy":
	default:
		if row < len(s.warmest)-1 {
			row++
			st.Shifted = true
		}
	}
	c := s.cells[row][col]
	st.Row, st.RowWarmestC, st.Cell = row, s.warmest[row], c.text
	st.Kind, st.MaxWorkMin, st.Breaks = c.kind, c.maxWorkMin, c.breaks
	return st
}
