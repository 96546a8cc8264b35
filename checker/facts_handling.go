package checker

import (
	"strconv"
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
// converting section's gives, without the maps between. The terms and texts
// each entry makes afresh come from blocks made once for the section
// (entryBlocks).
func (ah *animalHandling) sectionTerm(c *converter) (*ast.Term, error) {
	t := ah.t
	b := newEntryBlocks(len(ah.rows), 3, 2, func(buf []byte, i, k int) []byte {
		r := &ah.rows[i]
		if k == 0 {
			return appendStamp(buf, stampDayOf(t.days, r.day), r.minute)
		}
		return appendRef(buf, t.refs, r.ref)
	})
	elems := make([]*ast.Term, len(ah.rows))
	var pairs [14][2]*ast.Term
	for i := range ah.rows {
		r := &ah.rows[i]
		pairs = [14][2]*ast.Term{
			{keyOn, t.days.term(c, r.day)},
			{keyAt, b.text(i, 0)},
			{keyRef, b.text(i, 1)},
			{keyStaff, t.textTerms[r.staff]},
			{keyPurpose, t.textTerms[r.purpose]},
			{keyRestraint, textOrNull(t, r.restraint)},
			{keyGlove, textOrNull(t, r.glove)},
			{keyThickness, numTerm(c, r.flags&hasThickness != 0, r.thickness)},
			{keyPPE, t.ppeTerms[r.ppe]},
			{keyDuration, numTerm(c, r.flags&hasDuration != 0, r.duration)},
			{keyBite, ast.InternedTerm(r.flags&wasBite != 0)},
			{keyScratch, ast.InternedTerm(r.flags&wasScratch != 0)},
			{keyWoundWashed, ast.InternedTerm(r.flags&woundWashed != 0)},
			{keyReported, numTerm(c, r.flags&hasReported != 0, r.reported)},
		}
		elems[i] = b.term(ast.NewObject(pairs[:]...))
	}
	return ast.NewTerm(ast.NewArray(elems...)), nil
}

// entryBlocks hands out the terms and texts the entries of one lazy
// section make afresh (an entry's object, its time stamp, its ref) from
// blocks made once for the section, not one allocation each: a block of
// terms, and the entries' texts written into one string, each a slice of it.
type entryBlocks struct {
	terms []ast.Term
	texts string
	ends  []int32 // where each text ends in texts, texts per entry in a row
	per   int
}

// newEntryBlocks makes the blocks for n entries of terms terms and texts
// texts each; write appends entry i's text k to buf.
func newEntryBlocks(n, terms, texts int, write func(buf []byte, i, k int) []byte) *entryBlocks {
	b := &entryBlocks{terms: make([]ast.Term, 0, n*terms), ends: make([]int32, n*texts), per: texts}
	buf := make([]byte, 0, n*texts*20)
	for i := range n {
		for k := range texts {
			buf = write(buf, i, k)
			b.ends[i*texts+k] = int32(len(buf))
		}
	}
	b.texts = string(buf)
	return b
}

// term is a term of the block holding v.
func (b *entryBlocks) term(v ast.Value) *ast.Term {
	b.terms = append(b.terms, ast.Term{Value: v})
	return &b.terms[len(b.terms)-1]
}

// text is entry i's text k as a string term of the block.
func (b *entryBlocks) text(i, k int) *ast.Term {
	j := i*b.per + k
	start := int32(0)
	if j > 0 {
		start = b.ends[j-1]
	}
	return b.term(ast.String(b.texts[start:b.ends[j]]))
}

// stampDayOf is stampDay's text of d, the period's shared text when d is
// in the period.
func stampDayOf(days *dayValues, d records.Day) string {
	if s, ok := days.of(d).(string); ok && s != "" {
		return s
	}
	return stampDay(d)
}

// appendStamp appends minuteStampOf(day, minute) to buf.
func appendStamp(buf []byte, day string, minute uint16) []byte {
	h, m := minute/60, minute%60
	return append(append(buf, day...), ' ', byte('0'+h/10), byte('0'+h%10), ':', byte('0'+m/10), byte('0'+m%10))
}

// appendRef appends the text of the kept ref r (rowRefs.ref) to buf.
func appendRef(buf []byte, t *rowRefs, r rowRef) []byte {
	buf = append(buf, t.parts[r.part]...)
	if r.line != 0 {
		buf = strconv.AppendUint(buf, uint64(r.line), 10)
	}
	return buf
}

// orNull is v, or null when the text s it stands for is empty.
func orNull(v any, s string) any {
	if s == "" {
		return nil
	}
	return v
}
