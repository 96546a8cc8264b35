package checker

import (
	"encoding/json"
	"math"
	"strconv"
	"unsafe"

	"github.com/open-policy-agent/opa/v1/ast"
)

// converter turns subject documents (the facts' map[string]any, []any,
// []string, string, float64, int, bool and nil, and lazy sections, made
// here; anything else goes to ast.InterfaceToValue) into the OPA values the
// rules are evaluated on.
// It gives the same values as ast.InterfaceToValue, with less work on the
// documents the facts build:
//
//   - a map (or a list of 4 or more) given in several places of a
//     document (a heat run shared by the days of the run) is converted
//     once and its term reused, and so is one given to several subjects
//     one after the other (a site's run shared by the enclosures of that
//     site): it remembers the containers of the subject it converts and
//     of the one before;
//   - an enclosure's cold water groups (a site's days by water checks,
//     the same for most enclosures of a site) are kept by what they are
//     made from for the whole conversion (encCold.waterTerms);
//   - object keys, short strings (days, times, bands, kinds) and
//     numbers are converted once per converter and their terms reused;
//     every empty list is one term.
//
// OPA values are immutable once built, so sharing a term among documents
// and among the objects of one document is safe. A converter is used by
// one goroutine (one worker of Evaluate) and lives for one Evaluate call:
// the documents it remembers are not changed while it runs.
type converter struct {
	keys map[string]*ast.Term
	strs map[string]*ast.Term
	nums map[float64]*ast.Term
	// Containers by identity: cur holds those of the subject being
	// converted, prev those of the subject before.
	cur, prev containerMemo
	// pairs is a stack of the key-value pairs of the objects being
	// built (ast.NewObject copies them out).
	pairs [][2]*ast.Term
	// coldWater keeps the enclosures' cold water groups made (waterTerms),
	// to give them again to the enclosures that have the same.
	coldWater map[coldWaterKey]coldWaterGroup
}

type containerMemo struct {
	maps   map[unsafe.Pointer]*ast.Term
	slices map[sliceID]*ast.Term
}

// sliceID names a slice by its first element and length: two slices with
// both the same hold the same elements.
type sliceID struct {
	data unsafe.Pointer
	n    int
}

// Past these sizes a converter's tables are emptied, so its memory stays
// bounded however many subjects it converts.
const (
	maxInternedKeys    = 1 << 12
	maxInternedStrings = 1 << 16
	maxInternedNumbers = 1 << 16
	// Longer string values are not kept: at 1,000 animals a year's
	// documents hold 1.6 M string values, 0.5 M of them refs of 19 to 22
	// bytes used once or twice, while the days (10 bytes), times, bands
	// and kinds repeat hundreds of times.
	maxInternedLen = 18
	// Shorter slices (the evidence refs of one day: most slices) are not
	// remembered: looking them up costs about what converting them does.
	minSharedSlice = 4
)

// emptyArray is the term of every empty list.
var emptyArray = ast.NewTerm(ast.InternedEmptyArrayValue)

func newConverter() *converter {
	return &converter{
		keys: map[string]*ast.Term{},
		strs: map[string]*ast.Term{},
		nums: map[float64]*ast.Term{},
		cur:  containerMemo{maps: map[unsafe.Pointer]*ast.Term{}, slices: map[sliceID]*ast.Term{}},
		prev: containerMemo{maps: map[unsafe.Pointer]*ast.Term{}, slices: map[sliceID]*ast.Term{}},
	}
}

// document converts one subject's document.
func (c *converter) document(doc map[string]any) (ast.Value, error) {
	c.prev, c.cur = c.cur, c.prev
	clear(c.cur.maps)
	clear(c.cur.slices)
	if len(c.keys) > maxInternedKeys {
		clear(c.keys)
	}
	if len(c.strs) > maxInternedStrings {
		clear(c.strs)
	}
	if len(c.nums) > maxInternedNumbers {
		clear(c.nums)
	}
	return c.object(doc)
}

func (c *converter) object(m map[string]any) (ast.Value, error) {
	start := len(c.pairs)
	defer func() { c.pairs = c.pairs[:start] }()
	for k, v := range m {
		t, err := c.term(v)
		if err != nil {
			return nil, err
		}
		c.pairs = append(c.pairs, [2]*ast.Term{c.key(k), t})
	}
	return ast.NewObject(c.pairs[start:]...), nil
}

func (c *converter) array(s []any) (ast.Value, error) {
	elems := make([]*ast.Term, len(s))
	for i, v := range s {
		t, err := c.term(v)
		if err != nil {
			return nil, err
		}
		elems[i] = t
	}
	return ast.NewArray(elems...), nil
}

// term converts one value of a document.
func (c *converter) term(v any) (*ast.Term, error) {
	switch v := v.(type) {
	case nil:
		return ast.InternedNullTerm, nil
	case string:
		return c.str(v), nil
	case bool:
		return ast.InternedTerm(v), nil
	case int:
		return ast.InternedTerm(v), nil
	case float64:
		return c.num(v), nil
	case map[string]any:
		id := *(*unsafe.Pointer)(unsafe.Pointer(&v))
		if t := c.memoMap(id); t != nil {
			return t, nil
		}
		val, err := c.object(v)
		if err != nil {
			return nil, err
		}
		t := ast.NewTerm(val)
		c.cur.maps[id] = t
		return t, nil
	case []any:
		if len(v) == 0 {
			return emptyArray, nil
		}
		if len(v) < minSharedSlice {
			val, err := c.array(v)
			if err != nil {
				return nil, err
			}
			return ast.NewTerm(val), nil
		}
		id := sliceID{unsafe.Pointer(unsafe.SliceData(v)), len(v)}
		if t := c.memoSlice(id); t != nil {
			return t, nil
		}
		val, err := c.array(v)
		if err != nil {
			return nil, err
		}
		t := ast.NewTerm(val)
		c.cur.slices[id] = t
		return t, nil
	case []string:
		elems := make([]*ast.Term, len(v))
		for i, s := range v {
			elems[i] = c.str(s)
		}
		return ast.NewTerm(ast.NewArray(elems...)), nil
	case *ast.Term:
		return v, nil
	case *lazy:
		// Made for this conversion and let go after it (lazy.go).
		if v.term != nil {
			return v.term(c)
		}
		return c.term(v.make())
	}
	val, err := ast.InterfaceToValue(v)
	if err != nil {
		return nil, err
	}
	return ast.NewTerm(val), nil
}

func (c *converter) memoMap(id unsafe.Pointer) *ast.Term {
	if t, ok := c.cur.maps[id]; ok {
		return t
	}
	if t, ok := c.prev.maps[id]; ok {
		c.cur.maps[id] = t
		return t
	}
	return nil
}

func (c *converter) memoSlice(id sliceID) *ast.Term {
	if t, ok := c.cur.slices[id]; ok {
		return t
	}
	if t, ok := c.prev.slices[id]; ok {
		c.cur.slices[id] = t
		return t
	}
	return nil
}

// key converts an object key: the facts use a few hundred.
func (c *converter) key(s string) *ast.Term {
	if t, ok := c.keys[s]; ok {
		return t
	}
	t := ast.InternedTerm(s)
	c.keys[s] = t
	return t
}

func (c *converter) str(s string) *ast.Term {
	if len(s) > maxInternedLen {
		return ast.InternedTerm(s)
	}
	if t, ok := c.strs[s]; ok {
		return t
	}
	t := ast.InternedTerm(s)
	c.strs[s] = t
	return t
}

// num converts a float64 as ast.InterfaceToValue does (its shortest
// decimal form); zero (whose sign the form keeps) and NaN are not kept.
func (c *converter) num(f float64) *ast.Term {
	if t, ok := c.nums[f]; ok {
		return t
	}
	t := ast.NumberTerm(json.Number(strconv.FormatFloat(f, 'g', -1, 64)))
	if f != 0 && !math.IsNaN(f) {
		c.nums[f] = t
	}
	return t
}
