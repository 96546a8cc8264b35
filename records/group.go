package records

import (
	"strconv"
	"strings"
)

// ProblemGroup is one problem repeated on several rows of one file: the
// first row's problem, and the lines (or spreadsheet rows) of the others.
type ProblemGroup struct {
	First Problem
	More  []int // lines of the other rows like it, in order
}

// GroupProblems gathers the problems that repeat on many rows of one file,
// for a terminal: rows are alike when they have the same column and the same
// reason, or the same Kind (a decimal comma, a day-first date, text that is
// not UTF-8), or, for an unknown reference, the same missing id. Whole-file
// problems stay on their own. Groups keep the order of their first row.
// Nothing is dropped: every problem is a group's First or one of its More.
func GroupProblems(ps []Problem) []ProblemGroup {
	var out []ProblemGroup
	at := map[string]int{}
	for _, p := range ps {
		if p.Line == 0 {
			out = append(out, ProblemGroup{First: p})
			continue
		}
		key := groupKey(&p)
		if i, ok := at[key]; ok {
			out[i].More = append(out[i].More, p.Line)
			continue
		}
		at[key] = len(out)
		out = append(out, ProblemGroup{First: p})
	}
	return out
}

func groupKey(p *Problem) string {
	sheet, _, _ := strings.Cut(p.At, "!")
	key := p.File + "\x00" + sheet + "\x00" + p.Column + "\x00"
	switch p.Kind {
	case "":
		return key + p.Reason
	case KindUnknownRef:
		return key + p.Kind + "\x00" + p.Value
	}
	return key + p.Kind
}

// Rows is the number of rows the group stands for.
func (g ProblemGroup) Rows() int { return 1 + len(g.More) }

// String is the first problem, then, when others are like it, a second line:
// "… and 211 more rows like it: lines 14–226".
func (g ProblemGroup) String() string {
	s := g.First.Error()
	if len(g.More) == 0 {
		return s
	}
	rows := "rows"
	if len(g.More) == 1 {
		rows = "row"
	}
	what := "line"
	if g.First.At != "" {
		what = "row"
	}
	if len(g.More) > 1 {
		what += "s"
	}
	return s + "\n… and " + strconv.Itoa(len(g.More)) + " more " + rows + " like it: " + what + " " + Spans(g.More)
}

// Spans writes ascending numbers as runs: "14–226" or "3, 7–9, 12"; after
// eight runs the rest is "…".
func Spans(ns []int) string {
	var b strings.Builder
	runs := 0
	for i := 0; i < len(ns); {
		j := i
		for j+1 < len(ns) && ns[j+1] == ns[j]+1 {
			j++
		}
		if runs == 8 {
			b.WriteString(", …")
			break
		}
		if runs > 0 {
			b.WriteString(", ")
		}
		b.WriteString(strconv.Itoa(ns[i]))
		if j > i {
			b.WriteString("–")
			b.WriteString(strconv.Itoa(ns[j]))
		}
		runs++
		i = j + 1
	}
	return b.String()
}
