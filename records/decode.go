package records

import (
	"fmt"
	"reflect"
	"strconv"
	"strings"
	"sync"
	"time"
	"unicode/utf8"
	"unsafe"
)

// fieldKind is how a cell is read into a Go field.
type fieldKind uint8

const (
	kString fieldKind = iota
	kDay
	kTime
	kBool
	kFloat
	kFloatPtr
	kInt
	kIntPtr
	kList
)

// field is one csv-tagged struct field, described once per row type.
type field struct {
	index    int
	offset   uintptr      // of the Go field in the struct, where decode writes it
	typ      reflect.Type // of the Go field
	goName   string
	name     string   // column name, or the base name when unit is set
	unit     unitKind // "" for a unitless column
	required bool     // the column must exist and its cells must not be empty
	kind     fieldKind
	intern   bool   // ids and codes repeat across rows: share one string
	later    bool   // a date that may lie years ahead (laterColumns)
	vtag     string // the validate tag, run on each distinct cell value
	// The plausible range from the validate tag, for keeper-readable reasons.
	lo, hi         string
	loOpen, hasRng bool
	// bounds, for a number whose validate tag is a range and nothing else:
	// a value inside it is valid without asking the validator (one outside
	// is asked, for its reason).
	bounds *numRange
}

// numRange is a validate tag of gt/gte/lt/lte rules alone, compared as the
// validator compares a float field with them.
type numRange struct {
	lo, hi         float64
	hasLo, hasHi   bool
	loOpen, hiOpen bool
}

func (r *numRange) holds(v float64) bool {
	switch {
	case r.hasLo && r.loOpen && !(v > r.lo), r.hasLo && !r.loOpen && !(v >= r.lo):
		return false
	case r.hasHi && r.hiOpen && !(v < r.hi), r.hasHi && !r.hiOpen && !(v <= r.hi):
		return false
	}
	return true
}

// rangeOf reads a validate tag made of gt, gte, lt and lte rules alone.
func rangeOf(vtag string) (*numRange, bool) {
	if vtag == "" {
		return nil, false
	}
	r := &numRange{}
	for rule := range strings.SplitSeq(vtag, ",") {
		name, param, _ := strings.Cut(rule, "=")
		v, err := strconv.ParseFloat(param, 64)
		if err != nil {
			return nil, false
		}
		switch name {
		case "gt", "gte":
			r.lo, r.hasLo, r.loOpen = v, true, name == "gt"
		case "lt", "lte":
			r.hi, r.hasHi, r.hiOpen = v, true, name == "lt"
		default:
			return nil, false
		}
	}
	return r, true
}

// rowType is the decoding description of one record type, built from its
// struct tags once and shared by every file of that type.
type rowType struct {
	typ    reflect.Type
	fields []field
	byGo   map[string]int // Go field name -> index in fields
	ref    int            // index of the Ref field
}

var rowTypes sync.Map // reflect.Type -> *rowType

func rowTypeOf(t reflect.Type) (*rowType, error) {
	if rt, ok := rowTypes.Load(t); ok {
		return rt.(*rowType), nil
	}
	rt := &rowType{typ: t, byGo: map[string]int{}, ref: -1}
	for i := 0; i < t.NumField(); i++ {
		sf := t.Field(i)
		if sf.Type == reflect.TypeFor[Ref]() {
			rt.ref = i
			continue
		}
		tag, ok := sf.Tag.Lookup("csv")
		if !ok {
			continue
		}
		parts := strings.Split(tag, ",")
		f := field{index: i, offset: sf.Offset, typ: sf.Type, goName: sf.Name, name: parts[0], later: laterColumns[parts[0]]}
		for _, opt := range parts[1:] {
			switch {
			case opt == "required":
				f.required = true
			case strings.HasPrefix(opt, "unit="):
				f.unit = unitKind(strings.TrimPrefix(opt, "unit="))
				if _, ok := units[f.unit]; !ok {
					return nil, fmt.Errorf("records: %s.%s: unknown unit %q", t.Name(), sf.Name, f.unit)
				}
			default:
				return nil, fmt.Errorf("records: %s.%s: unknown csv tag option %q", t.Name(), sf.Name, opt)
			}
		}
		switch sf.Type {
		case reflect.TypeFor[string]():
			f.kind = kString
		case reflect.TypeFor[Day]():
			f.kind = kDay
		case reflect.TypeFor[time.Time]():
			f.kind = kTime
		case reflect.TypeFor[Bool]():
			f.kind = kBool
		case reflect.TypeFor[float64]():
			f.kind = kFloat
		case reflect.TypeFor[*float64]():
			f.kind = kFloatPtr
		case reflect.TypeFor[int]():
			f.kind = kInt
		case reflect.TypeFor[*int]():
			f.kind = kIntPtr
		case reflect.TypeFor[[]string]():
			f.kind = kList
		default:
			return nil, fmt.Errorf("records: %s.%s: no decoder for %s", t.Name(), sf.Name, sf.Type)
		}
		v := sf.Tag.Get("validate")
		// Only present cells are validated (an empty cell is "not recorded"),
		// so omitempty must not also skip a written 0.
		f.vtag = strings.TrimPrefix(strings.TrimPrefix(v, "omitempty"), ",")
		f.intern = strings.Contains(v, "id") || strings.Contains(v, "code") || strings.Contains(v, "oneof")
		for rule := range strings.SplitSeq(v, ",") {
			if rule == "dive" {
				break // the rest applies to list elements
			}
			name, param, _ := strings.Cut(rule, "=")
			switch name {
			case "gt", "gte":
				f.lo, f.loOpen, f.hasRng = param, name == "gt", true
			case "lt", "lte":
				f.hi, f.hasRng = param, true
			}
		}
		if f.kind == kFloat || f.kind == kFloatPtr {
			if r, ok := rangeOf(f.vtag); ok {
				f.bounds = r
			}
		}
		rt.byGo[sf.Name] = len(rt.fields)
		rt.fields = append(rt.fields, f)
	}
	if rt.ref < 0 {
		return nil, fmt.Errorf("records: %s has no Ref field", t.Name())
	}
	actual, _ := rowTypes.LoadOrStore(t, rt)
	return actual.(*rowType), nil
}

// column is one header cell of a file, resolved against the row type.
type column struct {
	header string   // as written, trimmed
	field  int      // index into rowType.fields, -1 when unknown
	alt    *unitAlt // the unit this column is written in
}

// plan is how one file's columns map onto its row type: computed once from
// the header, then applied to every row.
type plan struct {
	rt    *rowType
	cols  []column
	colOf []int // field index -> column index, -1 when the file lacks it
}

// has reports whether the file has a column for the Go field.
func (p *plan) has(goName string) bool {
	i, ok := p.rt.byGo[goName]
	return ok && p.colOf[i] >= 0
}

// header returns the column name as written for the Go field, or the
// field's SI name when the file lacks it.
func (p *plan) header(goName string) string {
	i, ok := p.rt.byGo[goName]
	if !ok {
		return goName
	}
	if c := p.colOf[i]; c >= 0 {
		return p.cols[c].header
	}
	return siName(&p.rt.fields[i])
}

// siName is the column name in the SI unit, as records.md documents it.
func siName(f *field) string {
	if f.unit == "" {
		return f.name
	}
	return f.name + units[f.unit][0].suffix
}

// alternatives names a measured column's accepted spellings.
func alternatives(f *field) string {
	if f.unit == "" {
		return f.name
	}
	alts := units[f.unit]
	var b strings.Builder
	b.WriteString(f.name + alts[0].suffix)
	for i, a := range alts[1:] {
		if i == len(alts)-2 {
			b.WriteString(" or ")
		} else {
			b.WriteString(", ")
		}
		b.WriteString(f.name + a.suffix)
	}
	return b.String()
}

// headerIssue is a header problem that makes the whole file unusable.
type headerIssue struct {
	column, reason, kind string
	// missing lists the required columns that are missing, each with its
	// hint ("give one of air_temp_c or air_temp_f"), to name them all in one message.
	missing []missingColumn
}

type missingColumn struct{ name, hint string }

// joinMissing puts the missing columns of b into a, so a file with several
// missing columns gets one message naming each. An issue that is not
// about missing columns wins: it is reported alone.
func joinMissing(a, b *headerIssue) *headerIssue {
	switch {
	case b == nil:
		return a
	case a == nil && !isMissing(b):
		return b
	case a != nil && !isMissing(a):
		return a
	case b != nil && !isMissing(b):
		return b
	}
	var cols []missingColumn
	for _, h := range []*headerIssue{a, b} {
		if h == nil {
			continue
		}
		if len(h.missing) > 0 {
			cols = append(cols, h.missing...)
			continue
		}
		hint := ""
		if _, rest, ok := strings.Cut(h.reason, "("); ok {
			hint = strings.TrimSuffix(rest, ")")
		}
		cols = append(cols, missingColumn{h.column, hint})
	}
	if len(cols) == 1 {
		if a != nil {
			return a
		}
		return b
	}
	names := make([]string, len(cols))
	var hints []string
	for i, c := range cols {
		names[i] = c.name
		if c.hint != "" {
			hints = append(hints, c.name+": "+c.hint)
		}
	}
	reason := fmt.Sprintf("%d required columns are missing", len(cols))
	if len(hints) > 0 {
		reason += " (" + strings.Join(hints, "; ") + ")"
	}
	return &headerIssue{column: strings.Join(names, ", "), reason: reason, missing: cols}
}

func isMissing(h *headerIssue) bool {
	return len(h.missing) > 0 || strings.HasPrefix(h.reason, "required column is missing")
}

// newPlan resolves a header. It returns warnings for columns that are not
// read, and an issue when the file cannot be used at all.
func newPlan(rt *rowType, header []string) (*plan, []string, *headerIssue) {
	p := &plan{rt: rt, cols: make([]column, len(header)), colOf: make([]int, len(rt.fields))}
	for i := range p.colOf {
		p.colOf[i] = -1
	}
	seen := map[string]int{}
	var unknown []string
	for i, h := range header {
		h = strings.TrimSpace(h)
		p.cols[i] = column{header: h, field: -1}
		key := strings.ToLower(h)
		if key == "" {
			unknown = append(unknown, fmt.Sprintf("column %d has no name", i+1))
			continue
		}
		if j, dup := seen[key]; dup {
			return nil, nil, &headerIssue{column: h, reason: fmt.Sprintf("column appears twice (columns %d and %d)", j+1, i+1)}
		}
		seen[key] = i
		if fi, alt, ok := matchColumn(rt, key); ok {
			if c := p.colOf[fi]; c >= 0 {
				return nil, nil, &headerIssue{column: h, reason: fmt.Sprintf("two units for one measurement: %s and %s; keep one", p.cols[c].header, h)}
			}
			p.cols[i].field, p.cols[i].alt = fi, alt
			p.colOf[fi] = i
			continue
		}
		unknown = append(unknown, h)
	}
	var missing *headerIssue
	for fi := range rt.fields {
		f := &rt.fields[fi]
		if f.required && p.colOf[fi] < 0 {
			reason := "required column is missing"
			if f.unit != "" && len(units[f.unit]) > 1 {
				reason = "required column is missing (give one of " + alternatives(f) + ")"
			}
			missing = joinMissing(missing, &headerIssue{column: siName(f), reason: reason})
		}
	}
	// The plan is returned with the missing columns, so that the file's
	// own column rules can add theirs to the one message.
	return p, unknown, missing
}

func matchColumn(rt *rowType, key string) (int, *unitAlt, bool) {
	for fi := range rt.fields {
		f := &rt.fields[fi]
		if f.unit == "" {
			if key == f.name {
				return fi, nil, true
			}
			continue
		}
		if !strings.HasPrefix(key, f.name) {
			continue
		}
		alts := units[f.unit]
		for ai := range alts {
			if key == f.name+alts[ai].suffix {
				return fi, &alts[ai], true
			}
		}
	}
	return -1, nil, false
}

// cellError is the first problem found in a row.
type cellError struct {
	field  int // -1 for a row-level problem
	column string
	value  string
	reason string
	kind   string // Problem.Kind
}

// decoder reads rows of one file into T values, reusing its scratch space.
type decoder struct {
	p      *plan
	loc    *time.Location
	win    window // the plausible window of dates
	strs   map[string]string
	floats []float64 // slab for *float64 fields: one allocation per thousand rows, not per cell
	// scratch, when set, holds the *float64 fields of a row decoded into
	// one reused value (a file kept in a compact store): one per field,
	// overwritten by the next row.
	scratch []float64
	failed  []bool // per field: the cell did not decode, so validator errors on it are noise
	refBase string
	// verdicts memoises, per column, the validation reason of each distinct
	// cell ("" = valid): validation is a pure function of the cell, and a
	// million rows repeat a few hundred values.
	verdicts []map[string]*verdict
	// last is, per column, the verdict of its text cell read last: rows
	// repeat a cell, or follow the order of the rows before (a round of
	// the enclosures every day), so the next cell is looked for as that
	// one, then as the one that came after it, before the map.
	last []*verdict
	// kind is the Problem.Kind of the reason set last returned, if any.
	kind string
	// zone is the time zone of the last date a local time was read on.
	zone zoneCache
	// number is the value of the number cell set last, in its SI unit.
	number float64
}

// verdict is a validated cell: the reason it is invalid ("" when valid) and,
// for text fields, the shared copy of its value.
type verdict struct {
	val, reason string
	// next is the verdict of the cell that followed this one in the
	// column the last time it did.
	next *verdict
}

func newDecoder(p *plan, e *env, file string) *decoder {
	d := &decoder{p: p, loc: e.loc, win: e.window, strs: map[string]string{}, failed: make([]bool, len(p.rt.fields)), refBase: file + ":"}
	d.verdicts = make([]map[string]*verdict, len(p.cols))
	d.last = make([]*verdict, len(p.cols))
	for ci, c := range p.cols {
		if c.field >= 0 && p.rt.fields[c.field].vtag != "" {
			d.verdicts[ci] = map[string]*verdict{}
		}
	}
	return d
}

// seen is the verdict of a text cell of column ci met before, or nil.
func (d *decoder) seen(ci int, cell string) *verdict {
	last := d.last[ci]
	if last != nil {
		if last.val == cell {
			return last
		}
		if n := last.next; n != nil && n.val == cell {
			d.last[ci] = n
			return n
		}
	}
	v := d.verdicts[ci][cell]
	if v != nil {
		d.follow(ci, v)
	}
	return v
}

// follow makes v the verdict read last in column ci, after the one before.
func (d *decoder) follow(ci int, v *verdict) {
	if last := d.last[ci]; last != nil {
		last.next = v
	}
	d.last[ci] = v
}

// intern shares one copy of repeated ids and codes, so that a million rows
// naming the same enclosure hold one string, and the CSV line the cell was
// cut from can be freed.
func (d *decoder) intern(s string) string {
	if v, ok := d.strs[s]; ok {
		return v
	}
	s = strings.Clone(s)
	if len(d.strs) < 1<<16 {
		d.strs[s] = s
	}
	return s
}

func (d *decoder) newFloat(v float64) *float64 {
	if len(d.floats) == cap(d.floats) {
		d.floats = make([]float64, 0, 1024)
	}
	d.floats = append(d.floats, v)
	return &d.floats[len(d.floats)-1]
}

func (d *decoder) ref(line int) Ref {
	var buf [64]byte
	b := append(buf[:0], d.refBase...)
	b = strconv.AppendInt(b, int64(line), 10)
	return Ref(b)
}

// decode fills the struct rv (a T, addressable) from a record. It returns the
// first problem, but goes on decoding the remaining cells so that the row's
// date can still place a rejected row in time.
//
// Each field is written through a pointer of its own Go type (field.kind
// says which, rowTypeOf having matched the type exactly), at its offset in
// the struct: reflect describes the struct once, and is not asked again for
// every cell of millions of rows.
func (d *decoder) decode(rv reflect.Value, rec []string) *cellError {
	var first *cellError
	clear(d.failed)
	base := rv.Addr().UnsafePointer()
	for ci := range d.p.cols {
		col := &d.p.cols[ci]
		if col.field < 0 {
			continue
		}
		f := &d.p.rt.fields[col.field]
		raw := rec[ci]
		cell := raw
		if n := len(raw); n == 0 || raw[0] <= ' ' || raw[0] >= utf8.RuneSelf || raw[n-1] <= ' ' || raw[n-1] >= utf8.RuneSelf {
			// Only then can the cell start or end with a space (ASCII
			// letters, digits and punctuation are none).
			cell = strings.TrimSpace(raw)
		}
		if cell == "" {
			if f.required && first == nil {
				first = &cellError{field: col.field, column: col.header, reason: "is required but empty"}
				d.failed[col.field] = true
			}
			continue
		}
		fp := unsafe.Add(base, f.offset)
		var reason string
		var v *verdict
		if f.kind == kString && d.verdicts[ci] != nil {
			v = d.seen(ci, cell)
		}
		if v != nil {
			// A repeated id or code: its shared copy and its verdict in one lookup.
			*(*string)(fp) = v.val
			reason = v.reason
		} else {
			reason = d.set(fp, f, col, cell)
			// A number inside its range is valid, as the validator would say.
			inRange := reason == "" && f.bounds != nil && f.bounds.holds(d.number)
			if reason == "" && !inRange && d.verdicts[ci] != nil {
				reason = d.verdict(ci, fp, f, cell)
			}
		}
		if reason != "" {
			d.failed[col.field] = true
			if first == nil {
				first = &cellError{field: col.field, column: col.header, value: raw, reason: reason, kind: d.kind}
			}
			d.kind = ""
		}
	}
	return first
}

// set decodes a cell into the field at fp, of f's Go type.
func (d *decoder) set(fp unsafe.Pointer, f *field, col *column, cell string) string {
	switch f.kind {
	case kString:
		s := cell
		if f.intern {
			s = d.intern(cell)
		} else {
			s = strings.Clone(cell)
		}
		*(*string)(fp) = s
	case kDay:
		day, err := parseDate(cell)
		if err != nil {
			return d.dateReason(cell, err)
		}
		if why := d.win.check(day, f.later, cell); why != "" {
			return why
		}
		*(*Day)(fp) = day
	case kTime:
		t, err := d.zone.parseDateTime(cell, d.loc)
		if err != nil {
			return d.dateReason(cell, err)
		}
		if why := d.win.check(d.zone.dayOf(t), f.later, cell); why != "" {
			return why
		}
		*(*time.Time)(fp) = t
	case kBool:
		b, ok := parseBool(cell)
		if !ok {
			return fmt.Sprintf("%q is not yes or no (yes/no, y/n, true/false, 1/0)", cell)
		}
		*(*Bool)(fp) = b
	case kFloat, kFloatPtr:
		v, ok := parseNumber(cell)
		if !ok {
			return d.numberReason(cell, "a number")
		}
		if col.alt != nil {
			v = col.alt.toSI(v)
		}
		d.number = v
		switch {
		case f.kind == kFloat:
			*(*float64)(fp) = v
		case d.scratch != nil:
			d.scratch[f.index] = v
			*(**float64)(fp) = &d.scratch[f.index]
		default:
			*(**float64)(fp) = d.newFloat(v)
		}
	case kInt, kIntPtr:
		v, err := strconv.Atoi(cell)
		if err != nil {
			return d.numberReason(cell, "a whole number")
		}
		if f.kind == kInt {
			*(*int)(fp) = v
		} else {
			*(**int)(fp) = &v
		}
	case kList:
		*(*[]string)(fp) = parseList(cell, d.intern)
	}
	return ""
}
