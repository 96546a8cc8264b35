package checker

import (
	"strings"

	"github.com/open-policy-agent/opa/v1/ast"

	"welfare/records"
)

// handlingFacts adds to each handled animal's document its "handling"
// section: one entry per handling row of the period, with what the row
// recorded. The rules judge it against the species' bite risk and the
// handling limits (gloves, PPE, duration, bite reporting), so a committee
// that edits the limits edits the checks.
//
// The section is lazy (lazy.go): a year has tens of rows per animal, each a
// map of 14 values, so the facts keep each row's figures in a handlingRow
// (texts and PPE lists as indexes into tables the animals share, the ref as
// a rowRef) and the entries are made when the animal is evaluated.
func (f *facts) handlingFacts() {
	ht := &handlingTable{days: f.days, refs: newRowRefs(), texts: map[string]uint32{}, ppes: map[string]uint32{}}
	// The rows kept are counted per animal first, so every animal's rows
	// are cut from one block at their exact size.
	counts := map[*records.Animal]int{}
	total := 0
	for i := range f.set.Handling {
		h := &f.set.Handling[i]
		// A row naming an unknown animal was rejected by the loader's
		// reference check and is reported as records.row.rejected.
		if a := f.animals[h.AnimalID]; a != nil && f.inPeriod(records.DayOf(h.At)) {
			counts[a]++
			total++
		}
	}
	block := make([]handlingRow, 0, total)
	byAnimal := make(map[*records.Animal]*animalHandling, len(counts))
	for i := range f.set.Handling {
		h := &f.set.Handling[i]
		day := records.DayOf(h.At)
		a := f.animals[h.AnimalID]
		if a == nil || !f.inPeriod(day) {
			continue
		}
		row := handlingRow{
			day: day, minute: minuteOfDay(h.At), ref: ht.refs.code(h.Ref),
			staff: ht.text(h.StaffID), purpose: ht.text(h.Purpose),
			restraint: ht.text(h.Restraint), glove: ht.text(h.Glove), ppe: ht.ppe(h.PPE),
		}
		if h.GloveThicknessMm != nil {
			row.flags |= hasThickness
			row.thickness = *h.GloveThicknessMm
		}
		if h.DurationMin != nil {
			row.flags |= hasDuration
			row.duration = *h.DurationMin
		}
		if !h.ExposureReportedAt.IsZero() {
			row.flags |= hasReported
			row.reported = h.ExposureReportedAt.Sub(h.At).Hours()
		}
		if h.Bite.IsYes() {
			row.flags |= wasBite
		}
		if h.Scratch.IsYes() {
			row.flags |= wasScratch
		}
		if h.WoundWashed.IsYes() {
			row.flags |= woundWashed
		}
		ah := byAnimal[a]
		if ah == nil {
			n := counts[a]
			ah = &animalHandling{t: ht, rows: block[len(block) : len(block) : len(block)+n]}
			block = block[:len(block)+n]
			byAnimal[a] = ah
			f.animalDoc(a)["handling"] = &lazy{make: ah.section, term: ah.sectionTerm}
		}
		ah.rows = append(ah.rows, row)
	}
	ht.finish()
}

// handlingTable is what the handling sections of every animal share: the
// days, texts (people, purposes, restraints, gloves) and PPE lists a year
// of rows names again and again, each one document value (and one OPA
// value) shared by every entry that names it, and the rows' refs.
type handlingTable struct {
	days      *dayValues
	refs      *rowRefs
	texts     map[string]uint32
	textList  []string
	ppes      map[string]uint32
	ppeList   [][]string
	textTerms []*ast.Term
	ppeTerms  []*ast.Term
}

func (t *handlingTable) text(s string) uint32 {
	k, ok := t.texts[s]
	if !ok {
		k = uint32(len(t.textList))
		t.textList = append(t.textList, strings.Clone(s))
		t.texts[s] = k
	}
	return k
}

func (t *handlingTable) ppe(list []string) uint32 {
	s := strings.Join(list, "\x00")
	k, ok := t.ppes[s]
	if !ok {
		k = uint32(len(t.ppeList))
		t.ppeList = append(t.ppeList, list)
		t.ppes[s] = k
	}
	return k
}

// finish makes the shared values once the rows are read: the PPE lists as
// document values and every shared value as an OPA value. The tables used
// to build them are let go.
func (t *handlingTable) finish() {
	t.texts, t.ppes = nil, nil
	t.textTerms = make([]*ast.Term, len(t.textList))
	for i, s := range t.textList {
		t.textTerms[i] = ast.StringTerm(s)
	}
	t.ppeTerms = make([]*ast.Term, len(t.ppeList))
	for i, list := range t.ppeList {
		elems := make([]*ast.Term, len(list))
		for k, s := range list {
			elems[k] = ast.StringTerm(s)
		}
		t.ppeTerms[i] = ast.NewTerm(ast.NewArray(elems...))
	}
	t.days.makeTerms()
}

// handlingRow is one handling row as the facts keep it.
type handlingRow struct {
	day                                   records.Day
	minute                                uint16
	flags                                 uint8
	ref                                   rowRef
	staff, purpose, restraint, glove, ppe uint32
	thickness, duration, reported         float64
}

const (
	hasThickness uint8 = 1 << iota
	hasDuration
	hasReported
	wasBite
	wasScratch
	woundWashed
)

// animalHandling is an animal's handling rows in the period, in the order
// of handling.csv.
type animalHandling struct {
	t    *handlingTable
	rows []handlingRow
}

// stampDay is a day's text for a time stamp (Day.String gives day 0,
// 1970-01-01, as empty).
func stampDay(d records.Day) string {
	if d == 0 {
		return "1970-01-01"
	}
	return d.String()
}

// section makes the animal's handling section.
func (ah *animalHandling) section() any {
	t := ah.t
	out := make([]any, len(ah.rows))
	ppes := make(map[uint32][]any)
	for i, r := range ah.rows {
		ppe, ok := ppes[r.ppe]
		if !ok {
			ppe = strs(t.ppeList[r.ppe])
			ppes[r.ppe] = ppe
		}
		restraint, glove := t.textList[r.restraint], t.textList[r.glove]
		out[i] = map[string]any{
			"on":                   t.days.of(r.day),
			"at":                   minuteStampOf(stampDay(r.day), r.minute),
			"ref":                  t.refs.ref(r.ref),
			"staff":                t.textList[r.staff],
			"purpose":              t.textList[r.purpose],
			"restraint":            orNull(restraint, restraint),
			"glove":                orNull(glove, glove),
			"glove_thickness_mm":   numIf(r.flags&hasThickness != 0, r.thickness),
			"ppe":                  ppe,
			"duration_min":         numIf(r.flags&hasDuration != 0, r.duration),
			"bite":                 r.flags&wasBite != 0,
			"scratch":              r.flags&wasScratch != 0,
			"wound_washed":         r.flags&woundWashed != 0,
			"reported_after_hours": numIf(r.flags&hasReported != 0, r.reported),
		}
	}
	return out
}

// numIf is v, or null when it was not recorded.
func numIf(ok bool, v float64) any {
	if !ok {
		return nil
	}
	return v
}

// Keys of a handling entry.
var (
	keyOn          = ast.InternedTerm("on")
	keyAt          = ast.InternedTerm("at")
	keyRef         = ast.InternedTerm("ref")
	keyStaff       = ast.InternedTerm("staff")
	keyPurpose     = ast.InternedTerm("purpose")
	keyRestraint   = ast.InternedTerm("restraint")
	keyGlove       = ast.InternedTerm("glove")
	keyThickness   = ast.InternedTerm("glove_thickness_mm")
	keyPPE         = ast.InternedTerm("ppe")
	keyDuration    = ast.InternedTerm("duration_min")
	keyBite        = ast.InternedTerm("bite")
	keyScratch     = ast.InternedTerm("scratch")
	keyWoundWashed = ast.InternedTerm("wound_washed")
	keyReported    = ast.InternedTerm("reported_after_hours")
)

// numTerm is numIf's value as an OPA value.
func numTerm(c *converter, ok bool, v float64) *ast.Term {
	if !ok {
		return ast.InternedNullTerm
	}
	return c.num(v)
}

// textOrNull is a shared text's OPA value, null when it is empty.
func textOrNull(t *handlingTable, k uint32) *ast.Term {
	if t.textList[k] == "" {
		return ast.InternedNullTerm
	}
	return t.textTerms[k]
}

// sectionTerm makes the animal's handling section as the OPA value
// converting section's gives, without the maps between.
func (ah *animalHandling) sectionTerm(c *converter) (*ast.Term, error) {
	t := ah.t
	elems := make([]*ast.Term, len(ah.rows))
	for i, r := range ah.rows {
		elems[i] = ast.NewTerm(ast.NewObject(
			[2]*ast.Term{keyOn, t.days.term(c, r.day)},
			[2]*ast.Term{keyAt, ast.StringTerm(minuteStampOf(stampDay(r.day), r.minute))},
			[2]*ast.Term{keyRef, ast.StringTerm(t.refs.ref(r.ref))},
			[2]*ast.Term{keyStaff, t.textTerms[r.staff]},
			[2]*ast.Term{keyPurpose, t.textTerms[r.purpose]},
			[2]*ast.Term{keyRestraint, textOrNull(t, r.restraint)},
			[2]*ast.Term{keyGlove, textOrNull(t, r.glove)},
			[2]*ast.Term{keyThickness, numTerm(c, r.flags&hasThickness != 0, r.thickness)},
			[2]*ast.Term{keyPPE, t.ppeTerms[r.ppe]},
			[2]*ast.Term{keyDuration, numTerm(c, r.flags&hasDuration != 0, r.duration)},
			[2]*ast.Term{keyBite, ast.InternedTerm(r.flags&wasBite != 0)},
			[2]*ast.Term{keyScratch, ast.InternedTerm(r.flags&wasScratch != 0)},
			[2]*ast.Term{keyWoundWashed, ast.InternedTerm(r.flags&woundWashed != 0)},
			[2]*ast.Term{keyReported, numTerm(c, r.flags&hasReported != 0, r.reported)},
		))
	}
	return ast.NewTerm(ast.NewArray(elems...)), nil
}

// orNull is v, or null when the text s it stands for is empty.
func orNull(v any, s string) any {
	if s == "" {
		return nil
	}
	return v
}
