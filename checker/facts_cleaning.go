package checker

import (
	"slices"
	"sort"
	"strings"

	"github.com/open-policy-agent/opa/v1/ast"

	"welfare/records"
)

// Cleaning facts: each enclosure's "cleaning" section lists the gaps
// between qualifying events while it was occupied. An occupancy stretch
// (consecutive occupied days) is anchored at the later of its first day and
// the enclosure's first care round (a building round is a round of each of
// its enclosures); each round with cleaned: yes is a qualifying event. A
// gap runs from an event (or the anchor) to the day before the next event,
// or to the end of the stretch. The rule finds the first day more than
// clean_every_days after the gap's start, once per gap.
//
// A stretch that starts on the period's first day may have begun before
// it; its anchor is then the enclosure's first round, and cleanings before
// the period count, so the first days of a period are judged on the rounds
// before it.

func (f *facts) cleaningFacts() {
	// Each enclosure's (or building's) first round and its cleaning rounds,
	// from the one pass over the rounds (facts_rounds.go).
	type index struct {
		first records.Day
		refs  []records.Ref // the cleaning rounds', sorted by day, then ref
		on    []records.Day // their days
	}
	rix := f.roundIndex()
	enc := make(map[string]*index, len(f.set.Enclosures))
	bld := make(map[string]*index, len(f.set.Facility.Buildings))
	for i := range rix.places {
		p := &rix.places[i]
		m := enc
		if p.building {
			m = bld
		}
		m[p.id] = &index{first: p.first, refs: p.cleanedRef, on: p.cleanedOn}
	}
	// A year of gaps names the same days, the same period start and the
	// same enclosure row again and again: each is one document value,
	// shared by every gap that names it. The section is lazy (lazy.go):
	// the facts keep each gap's days, its kind and the ref of the round
	// it starts from (cleanGap), and the gaps' maps are made when the
	// enclosure is evaluated. Each enclosure's days, stretches and gaps
	// are worked out in buffers reused from one enclosure to the next; the
	// gaps kept are copied out at their exact size.
	day := f.days
	day.makeTerms() // the gaps' days as OPA values (sectionTerm)
	recorded := f.set.Present["daily_care.csv"]
	var days []records.Day
	var gaps []cleanGap
	var stretches [][2]records.Day
	for i := range f.set.Enclosures {
		e := &f.set.Enclosures[i]
		var first records.Day
		days = days[:0]
		own, shared := enc[e.ID], bld[e.BuildingID]
		for _, ix := range []*index{own, shared} {
			if ix == nil {
				continue
			}
			if first == 0 || ix.first < first {
				first = ix.first
			}
			days = append(days, ix.on...)
		}
		// refOf is the first round (by ref) that cleaned the enclosure on d.
		refOf := func(d records.Day) records.Ref {
			var best records.Ref
			found := false
			for _, ix := range []*index{own, shared} {
				if ix == nil {
					continue
				}
				if k, ok := slices.BinarySearch(ix.on, d); ok && (!found || ix.refs[k] < best) {
					best, found = ix.refs[k], true
				}
			}
			return best
		}
		if !slices.IsSorted(days) {
			slices.Sort(days)
		}
		ec := &encCleaning{day: day, ref: e.Ref, recorded: recorded}
		gaps = gaps[:0]
		stretches = f.appendStretches(stretches[:0], e.ID)
		for _, st := range stretches {
			if first == 0 {
				break // no round at all: nothing to count from
			}
			// The anchor: the later of the stretch's start and the first
			// round. A stretch that starts on the period's first day may
			// have begun before it, so its first round alone anchors it.
			from, kind := first, sinceFirstRound
			if st[0] != f.period.From && st[0] > first {
				from, kind = st[0], sinceOccupancy
			}
			if from > st[1] {
				continue
			}
			fromRef := records.Ref("")
			k := sort.Search(len(days), func(k int) bool { return days[k] >= from })
			for {
				until := st[1]
				var next records.Day
				if k < len(days) && days[k] <= st[1] {
					next = days[k]
					until = next - 1
				}
				if until > from && until >= f.period.From {
					gaps = append(gaps, cleanGap{from: from, until: until, since: kind, ref: fromRef})
				}
				if next == 0 {
					break
				}
				from, kind = next, sinceCleaned
				// The ref is formatted only when the next day opens a gap
				// that is kept: a cleaning the day before the next one (or
				// at the stretch's end) starts none.
				fromRef = ""
				for k < len(days) && days[k] == from {
					k++
				}
				nextEnd := st[1]
				if k < len(days) && days[k] <= st[1] {
					nextEnd = days[k] - 1
				}
				if nextEnd > from && nextEnd >= f.period.From {
					fromRef = refOf(from)
				}
			}
		}
		if len(gaps) > 0 {
			ec.gaps = slices.Clone(gaps)
		}
		f.doc("enclosure", e.ID)["cleaning"] = &lazy{make: ec.section, term: ec.sectionTerm, data: ec}
	}
}

// What a cleaning gap is counted from.
const (
	sinceFirstRound uint8 = iota
	sinceOccupancy
	sinceCleaned
)

var sinceNames = [...]string{sinceFirstRound: "first_round", sinceOccupancy: "occupancy", sinceCleaned: "cleaned"}

// sinceTerms are sinceNames as OPA values, made once.
var sinceTerms = [...]*ast.Term{
	sinceFirstRound: ast.StringTerm(sinceNames[sinceFirstRound]),
	sinceOccupancy:  ast.StringTerm(sinceNames[sinceOccupancy]),
	sinceCleaned:    ast.StringTerm(sinceNames[sinceCleaned]),
}

// encCleaning is an enclosure's cleaning section as the facts keep it.
type encCleaning struct {
	day      *dayValues
	ref      records.Ref // the enclosure's row
	recorded bool        // daily_care.csv was in the records
	gaps     []cleanGap
}

// cleanGap is one gap between qualifying events: its first and last day,
// what it is counted from and the round it starts from ("" when it starts
// from the anchor).
type cleanGap struct {
	from, until records.Day
	since       uint8
	ref         records.Ref
}

// sectionTerm makes the enclosure's cleaning section as the OPA value
// converting section's gives, without the maps between.
func (ec *encCleaning) sectionTerm(c *converter) (*ast.Term, error) {
	gaps := emptyArray
	if len(ec.gaps) > 0 {
		encRef := c.str(string(ec.ref))
		periodFrom := ec.day.term(c, ec.day.from)
		// The gaps' terms and evidence lists in one block each.
		fromKey, untilKey, daysKey := c.key("from"), c.key("until"), c.key("days")
		sinceKey, periodFromKey, evidenceKey := c.key("since"), c.key("period_from"), c.key("evidence")
		elems := make([]*ast.Term, len(ec.gaps))
		terms := make([]ast.Term, 3*len(ec.gaps))
		evs := make([]*ast.Term, 0, 2*len(ec.gaps))
		for i, g := range ec.gaps {
			at := len(evs)
			evs = append(evs, encRef)
			if g.ref != "" {
				ref := &terms[3*i+2]
				ref.Value = ast.String(g.ref)
				evs = append(evs, ref)
			}
			ev := &terms[3*i]
			ev.Value = ast.NewArray(evs[at:len(evs):len(evs)]...)
			gap := &terms[3*i+1]
			gap.Value = ast.NewObject(
				[2]*ast.Term{fromKey, ec.day.term(c, g.from)},
				[2]*ast.Term{untilKey, ec.day.term(c, g.until)},
				[2]*ast.Term{daysKey, ast.InternedTerm(int(g.until - g.from))},
				[2]*ast.Term{sinceKey, sinceTerms[g.since]},
				[2]*ast.Term{periodFromKey, periodFrom},
				[2]*ast.Term{evidenceKey, ev},
			)
			elems[i] = gap
		}
		gaps = ast.NewTerm(ast.NewArray(elems...))
	}
	longest := ast.InternedNullTerm
	if n, ok := ec.longestGap(); ok {
		longest = ast.InternedTerm(n)
	}
	return ast.NewTerm(ast.NewObject(
		[2]*ast.Term{c.key("rounds_recorded"), ast.InternedTerm(ec.recorded)},
		[2]*ast.Term{c.key("gaps"), gaps},
		[2]*ast.Term{c.key("longest_gap_days"), longest},
	)), nil
}

// longestGap is the days of the section's longest gap; false when it has
// none.
func (ec *encCleaning) longestGap() (int, bool) {
	if len(ec.gaps) == 0 {
		return 0, false
	}
	n := 0
	for _, g := range ec.gaps {
		n = max(n, int(g.until-g.from))
	}
	return n, true
}

// appendGaps appends the section's gaps as the report lists them: the
// days the made section gives, without making its maps.
func (ec *encCleaning) appendGaps(out []CleaningGap, id string) []CleaningGap {
	for _, g := range ec.gaps {
		out = append(out, CleaningGap{Enclosure: id, From: g.from, Until: g.until, Days: int(g.until - g.from)})
	}
	return out
}

// section makes the enclosure's cleaning section.
func (ec *encCleaning) section() any {
	var encRef any = string(ec.ref)
	periodFrom := ec.day.of(ec.day.from)
	gaps := make([]any, len(ec.gaps))
	for i, g := range ec.gaps {
		evidence := []any{encRef}
		if g.ref != "" {
			evidence = append(evidence, string(g.ref))
		}
		gaps[i] = map[string]any{
			"from": ec.day.of(g.from), "until": ec.day.of(g.until), "days": int(g.until - g.from),
			"since": sinceNames[g.since], "period_from": periodFrom,
			"evidence": evidence,
		}
	}
	var longest any
	if n, ok := ec.longestGap(); ok {
		longest = n
	}
	return map[string]any{
		"rounds_recorded":  ec.recorded,
		"gaps":             gaps,
		"longest_gap_days": longest,
	}
}

// appendStretches appends the enclosure's runs of consecutive occupied
// days to out, as [first, last] pairs.
func (f *facts) appendStretches(out [][2]records.Day, encID string) [][2]records.Day {
	for _, s := range f.segments[encID] {
		if n := len(out); n > 0 && out[n-1][1]+1 == s.From {
			out[n-1][1] = s.To
			continue
		}
		out = append(out, [2]records.Day{s.From, s.To})
	}
	return out
}

// needMet reports whether a check's need is in the records: a file name
// ("daily_care.csv"), or a column of a file ("daily_care.csv:cleaned"),
// which the file must have had in its header. what names the need as the
// "not evaluated" reason says it.
func needMet(set *records.Set, need string) (what string, ok bool) {
	file, column, isColumn := strings.Cut(need, ":")
	if !isColumn {
		return file, set.Present[file]
	}
	if !set.Present[file] {
		return file, false
	}
	return file + " column " + column, set.HasColumn(file, column)
}
