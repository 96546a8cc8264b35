package rules

import (
	"bytes"
	"errors"
	"fmt"
	"reflect"
	"regexp"
	"slices"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"

	"welfare/records"
)

// ParseLimitsOver reads a limits file that holds only a committee's
// changes and lays it over the shipped defaults key by key: mappings are
// merged (a key the file does not name keeps its default), lists and single
// values are replaced. The file is decoded strictly on its own first, so an
// unknown key or a value of the wrong type is an error at its line in the
// file; the merged limits are then validated as a whole file is, and a
// problem is reported at the line of the file that caused it. The limits
// keep the merged text (Source, Lines: the limits in force) and what
// changed from the defaults (Changes).
func ParseLimitsOver(name string, src []byte) (*Limits, error) {
	var scratch Limits
	doc, err := records.DecodeYAML(name, src, &scratch)
	if err != nil {
		return nil, plainTypeError(err)
	}
	if doc.Kind != yaml.MappingNode {
		return nil, &records.LoadError{File: name, Line: doc.Line, Reason: "is not a mapping of limits (key: value)"}
	}
	var base yaml.Node
	if err := yaml.Unmarshal(DefaultLimits(), &base); err != nil || len(base.Content) == 0 {
		return nil, fmt.Errorf("built-in limits: %v", err)
	}
	mergeNodes(base.Content[0], doc)
	var buf bytes.Buffer
	enc := yaml.NewEncoder(&buf)
	enc.SetIndent(2)
	if err := enc.Encode(&base); err != nil {
		return nil, &records.LoadError{File: name, Reason: "cannot be laid over the built-in limits: " + err.Error(), Err: err}
	}
	merged := buf.Bytes()
	var l Limits
	if _, err := records.DecodeYAML(name, merged, &l); err != nil {
		// The file decoded on its own; a clash with the defaults' shape
		// (a list given where a mapping stands) is positioned in the file.
		return nil, &records.LoadError{File: name, Reason: "does not fit the built-in limits' shape: " + err.Error(), Err: err}
	}
	if key, reason := validateLimits(&l); reason != "" {
		return nil, &records.LoadError{File: name, Line: keyLine(doc, key), Column: key, Reason: reason}
	}
	l.name, l.src, l.doc, l.overlay = name, merged, doc, true
	return &l, nil
}

// mergeNodes lays the mapping over onto the mapping base: a key in both
// whose values are mappings is merged; any other key of over replaces (or
// is added to) base's, with the comments over gives it.
func mergeNodes(base, over *yaml.Node) {
	for i := 0; i+1 < len(over.Content); i += 2 {
		k, v := over.Content[i], over.Content[i+1]
		j := -1
		for x := 0; x+1 < len(base.Content); x += 2 {
			if base.Content[x].Value == k.Value {
				j = x
				break
			}
		}
		if j < 0 {
			base.Content = append(base.Content, k, markOwn(k, v))
			base.Style &^= yaml.FlowStyle // an added entry reads better on its own line
			continue
		}
		bv := base.Content[j+1]
		if bv.Kind == yaml.MappingNode && v.Kind == yaml.MappingNode {
			mergeNodes(bv, v)
			continue
		}
		base.Content[j], base.Content[j+1] = k, markOwn(k, v)
	}
}

// markOwn gives a value the committee set without a source comment the
// tag "[F] set by the committee", so that it never inherits the source of
// the default it replaced (or of the heading above it).
func markOwn(k, v *yaml.Node) *yaml.Node {
	if v.Kind == yaml.MappingNode && v.Style&yaml.FlowStyle == 0 {
		for i := 0; i+1 < len(v.Content); i += 2 {
			markOwn(v.Content[i], v.Content[i+1])
		}
		return v
	}
	if tagOf(k.LineComment, v.LineComment) == "" {
		v.LineComment = "# " + committeeTag
	}
	return v
}

// committeeTag is the source of a value a committee changed without
// saying where it comes from.
const committeeTag = "[F] set by the committee"

// Overlay is true when the limits were laid over the shipped defaults
// (ParseLimitsOver), false for a whole limits file.
func (l *Limits) Overlay() bool { return l.overlay }

// KeyLine is the line of a dotted key ("severity[care.observation.missed]",
// "handling.max_duration_min[weighing]") in the file the limits were read
// from: the line of the deepest part of it that the file holds, 0 when
// none.
func (l *Limits) KeyLine(key string) int {
	if l.doc == nil {
		return 0
	}
	return keyLine(l.doc, key)
}

// keyLine finds the line of a validator path in a YAML document, as
// records.KeyLine does, but also for map indexes holding dots (check ids:
// "severity[care.observation.missed]") and for indexes in a row
// ("handling.required_ppe[default][0]"); the line of the deepest part
// found, 0 when none.
func keyLine(doc *yaml.Node, key string) int {
	var parts []string // names and [indexes], in order
	for len(key) > 0 {
		if key[0] == '[' {
			end := strings.IndexByte(key, ']')
			if end < 0 {
				break
			}
			parts = append(parts, key[:end+1])
			key = key[end+1:]
			continue
		}
		key = strings.TrimPrefix(key, ".")
		end := strings.IndexAny(key, ".[")
		if end < 0 {
			end = len(key)
		}
		parts = append(parts, key[:end])
		key = key[end:]
	}
	line, n := 0, doc
	for _, p := range parts {
		idx, isIdx := strings.CutPrefix(p, "[")
		idx = strings.TrimSuffix(idx, "]")
		if !isIdx {
			idx = p
		}
		switch {
		case n == nil:
			return line
		case n.Kind == yaml.MappingNode:
			found := false
			for i := 0; i+1 < len(n.Content); i += 2 {
				if n.Content[i].Value == idx {
					line, n, found = n.Content[i].Line, n.Content[i+1], true
					break
				}
			}
			if !found {
				return line
			}
		case n.Kind == yaml.SequenceNode && isIdx:
			i, err := strconv.Atoi(idx)
			if err != nil || i < 0 || i >= len(n.Content) {
				return line
			}
			n = n.Content[i]
			line = n.Line
		default:
			return line
		}
	}
	return line
}

// LimitChange is one limit whose value differs from the shipped default.
type LimitChange struct {
	Key    string `json:"key"`
	Old    string `json:"old"`    // "" when the default has no such value
	New    string `json:"new"`    // "" when the file removed it
	Source string `json:"source"` // the source tag of the new value
}

// Changes lists the limits that differ from the shipped defaults, in the
// order of the limits file (removed values last), each with its old and
// new value and the new value's source tag.
func (l *Limits) Changes() []LimitChange {
	if len(l.src) == 0 {
		return nil
	}
	def := limitLines(DefaultLimits())
	old := map[string]LimitLine{}
	for _, d := range def {
		old[d.Key] = d
	}
	var out []LimitChange
	seen := map[string]bool{}
	for _, n := range limitLines(l.src) {
		seen[n.Key] = true
		o, ok := old[n.Key]
		if ok && o.Value == n.Value {
			continue
		}
		out = append(out, LimitChange{Key: n.Key, Old: o.Value, New: n.Value, Source: n.Source})
	}
	for _, d := range def {
		if !seen[d.Key] && !filledIn(d, seen) {
			out = append(out, LimitChange{Key: d.Key, Old: d.Value, Source: "removed"})
		}
	}
	return out
}

// filledIn: an empty default mapping (severity: {}) that the file filled
// in is not a removed value.
func filledIn(d LimitLine, seen map[string]bool) bool {
	if d.Value != "{}" && d.Value != "[]" {
		return false
	}
	for k := range seen {
		if strings.HasPrefix(k, d.Key+".") {
			return true
		}
	}
	return false
}

// Catalogues a limits key or value must come from, read from the records'
// own field rules so that the two never disagree.
var catalogues = map[string][]string{
	"purpose":   oneOf(records.Handling{}, "Purpose"),
	"ppe_item":  oneOf(records.Handling{}, "PPE"),
	"glove":     oneOf(records.Handling{}, "Glove"),
	"restraint": oneOf(records.Handling{}, "Restraint"),
	"item_kind": oneOf(records.PPECheck{}, "Item"),
	"sign":      oneOf(records.Observation{}, "Signs"),
}

// oneOf is the list of a field's validate "oneof=" tag.
func oneOf(row any, field string) []string {
	f, ok := reflect.TypeOf(row).FieldByName(field)
	if !ok {
		return nil
	}
	for part := range strings.SplitSeq(f.Tag.Get("validate"), ",") {
		if list, ok := strings.CutPrefix(part, "oneof="); ok {
			return strings.Fields(list)
		}
	}
	return nil
}

// inCatalogue reports whether s is in the named catalogue; "default" also
// stands for a purpose in required_ppe.
func inCatalogue(name, s string) bool {
	if name == "purpose_or_default" {
		return s == "default" || slices.Contains(catalogues["purpose"], s)
	}
	return slices.Contains(catalogues[name], s)
}

// catalogueReason says what a value outside its catalogue should have been.
func catalogueReason(name, v string) string {
	what := map[string]string{"purpose": "handling purpose", "purpose_or_default": "handling purpose",
		"ppe_item": "protective item (handling.csv ppe)", "glove": "glove (handling.csv glove)",
		"restraint": "restraint (handling.csv restraint)", "item_kind": "equipment kind (ppe_checks.csv item)",
		"sign": "sign (observations.csv signs)"}[name]
	list := catalogues[name]
	if name == "purpose_or_default" {
		list = append([]string{"default"}, catalogues["purpose"]...)
	}
	return fmt.Sprintf("%q is not a %s: one of %s", v, what, strings.Join(list, ", "))
}

func sortedKeys[V any](m map[string]V) []string {
	out := make([]string, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	slices.Sort(out)
	return out
}

// Line is the change on one line: "care.clean_every_days: 14 → 7  [F] ...".
func (c LimitChange) Line() string {
	old, nw := c.Old, c.New
	if old == "" {
		old = "(not set)"
	}
	if nw == "" {
		nw = "(removed)"
	}
	s := c.Key + ": " + old + " → " + nw
	if c.Source != "" && c.Source != "removed" {
		s += "  " + c.Source
	}
	return s
}

// notNumber is the decoder's message for text where a number belongs.
var notNumber = regexp.MustCompile("cannot unmarshal !!str `([^`]*)` into (float64|int)")

// plainTypeError rewords the decoder's type error for a committee: a value
// written with its unit ("0.8 m2", "7 days") is the usual slip, and the
// unit is in the key's name.
func plainTypeError(err error) error {
	var le *records.LoadError
	if !errors.As(err, &le) {
		return err
	}
	if m := notNumber.FindStringSubmatch(le.Reason); m != nil {
		what := "a number"
		if m[2] == "int" {
			what = "a whole number"
		}
		le.Reason = fmt.Sprintf("%q is not %s: write the value alone, in the unit the key names (_m2, _cm, _c, _days, _hours, _pct ...)", m[1], what)
	}
	return le
}
