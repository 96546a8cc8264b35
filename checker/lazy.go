package checker

import (
	"fmt"
	"strconv"
	"strings"
	"time"

	"github.com/open-policy-agent/opa/v1/ast"

	"welfare/records"
)

// A section of a subject's document may be given as a lazy value: compact
// Go data the fact builder keeps, and a function that makes the section's
// document value (map[string]any, []any, ... as any other section) from
// it. The converter makes the value when it converts the subject for the
// rules, converts it and lets it go, so the big maps of a section exist
// only while the subject's chunk is evaluated (check.go), not for every
// subject of every kind from the facts phase on.
//
// A builder gives &lazy{make: ...} as the section's value. A lazy value
// is always a whole section: a value of the document itself, never
// deeper. Its function is called again each time the section is
// read (nothing is remembered), must give the same value each time, and
// may share values the builder made once (a site's figures) among the
// sections it makes, as eager documents do.
//
// Everything that reads documents outside the rules' evaluation (explain,
// the report's figures, the partial counts, tests) reads them through
// resolve: section for one section, resolveDoc for a whole document.
type lazy struct {
	make func() any
	// term, when set, gives the section's OPA value directly, the value
	// converting make's gives (convert_test holds them to it), with less
	// work: the converter uses it, every other reader make.
	term func(c *converter) (*ast.Term, error)
	// data, when set, is the builder's compact data, for a reader that
	// knows its type and needs less than the whole section (cleaningGaps).
	data any
}

// resolve gives the plain value of a document's section: a lazy section
// made, any other value as it is.
func resolve(v any) any {
	if l, ok := v.(*lazy); ok {
		return l.make()
	}
	return v
}

// section is the plain value of a document's section key (nil when the
// document has none).
func section(d map[string]any, key string) any { return resolve(d[key]) }

// resolveDoc gives a document with its lazy sections made: the document
// itself when it has none, otherwise a shallow copy (the document is not
// changed, so its sections are made again at the next read).
func resolveDoc(d map[string]any) map[string]any {
	var out map[string]any
	for k, v := range d {
		if _, ok := v.(*lazy); !ok {
			continue
		}
		if out == nil {
			out = make(map[string]any, len(d))
			for k2, v2 := range d {
				out[k2] = v2
			}
		}
		out[k] = resolve(v)
	}
	if out == nil {
		return d
	}
	return out
}

// resolveDocs resolves each document of docs (resolveDoc), in a new slice.
func resolveDocs(docs []map[string]any) []map[string]any {
	out := make([]map[string]any, len(docs))
	for i, d := range docs {
		out[i] = resolveDoc(d)
	}
	return out
}

// rowRefs keeps the row refs a lazy section names compactly: each as its
// file part (kept once per table) and its line, 8 bytes instead of a string
// of about 20 bytes and its header. A ref is made again, the same text, when
// the section is made. A table is filled while the facts are built and only
// read after, so sections made at the same time may share it.
type rowRefs struct {
	parts []string
	index map[string]uint32
}

// rowRef is a ref kept by a rowRefs: line 0 when the part is the whole ref
// (a ref not ending in a line number without leading zero).
type rowRef struct {
	part, line uint32
}

func newRowRefs() *rowRefs { return &rowRefs{index: map[string]uint32{}} }

func (t *rowRefs) code(r records.Ref) rowRef {
	s := string(r)
	k := len(s)
	for k > 0 && s[k-1] >= '0' && s[k-1] <= '9' {
		k--
	}
	var line uint32
	if n := len(s) - k; n > 0 && n <= 9 && s[k] != '0' {
		v, _ := strconv.Atoi(s[k:])
		line = uint32(v)
		s = s[:k]
	}
	p, ok := t.index[s]
	if !ok {
		p = uint32(len(t.parts))
		t.parts = append(t.parts, strings.Clone(s))
		t.index[s] = p
	}
	return rowRef{part: p, line: line}
}

// ref is the text of a kept ref.
func (t *rowRefs) ref(r rowRef) string {
	if r.line == 0 {
		return t.parts[r.part]
	}
	return t.parts[r.part] + strconv.FormatUint(uint64(r.line), 10)
}

// minuteStampOf is "YYYY-MM-DD HH:MM" of a local minute: its day as text
// (Day.String) and the minute of that day, what minuteStamp gives the time.
func minuteStampOf(day string, minute uint16) string {
	var b [5]byte
	h, m := minute/60, minute%60
	b[0], b[1], b[2], b[3], b[4] = byte('0'+h/10), byte('0'+h%10), ':', byte('0'+m/10), byte('0'+m%10)
	return day + " " + string(b[:])
}

// minuteOfDay is the local clock's minute of the day of t (what
// records.DayOf counts days by).
func minuteOfDay(t time.Time) uint16 {
	_, off := t.Zone()
	s := t.Unix() + int64(off)
	s %= 86400
	if s < 0 {
		s += 86400
	}
	return uint16(s / 60)
}

// objectPairs converts a document made once and shared by many subjects'
// sections (a site-day's figures) into its key-value terms, with room for
// extra pairs the section adds per subject.
func objectPairs(c *converter, doc map[string]any, extra int) ([][2]*ast.Term, error) {
	t, err := c.term(doc)
	if err != nil {
		return nil, err
	}
	obj, ok := t.Value.(ast.Object)
	if !ok {
		return nil, fmt.Errorf("a shared figure is %T, not an object", t.Value)
	}
	pairs := make([][2]*ast.Term, 0, obj.Len()+extra)
	obj.Foreach(func(k, v *ast.Term) { pairs = append(pairs, [2]*ast.Term{k, v}) })
	return pairs, nil
}
