package rules

import (
	"bytes"
	"encoding/json"
	"fmt"
	"slices"
	"sort"
	"strings"
)

// The rules' input: one JSON schema per subject kind, in schemas/KIND.json.
// The checker gives them to the Rego compiler, so a rule that reads a field
// the input does not have fails to compile with its file, row and column;
// a test holds the checker's facts to the same schemas. Every document has
// kind and id at the top; the schemas list the rest.

// InputKinds lists the subject kinds that have an input schema, sorted.
func InputKinds() []string {
	entries, err := shipped.ReadDir("schemas")
	if err != nil {
		return nil
	}
	var out []string
	for _, e := range entries {
		if k, ok := strings.CutSuffix(e.Name(), ".json"); ok {
			out = append(out, k)
		}
	}
	sort.Strings(out)
	return out
}

// InputSchemaJSON is the JSON schema of the input documents of one subject
// kind, as shipped.
func InputSchemaJSON(kind string) ([]byte, error) {
	if !slices.Contains(InputKinds(), kind) {
		return nil, fmt.Errorf("no subject kind %q (kinds: %s)", kind, strings.Join(InputKinds(), ", "))
	}
	return shipped.ReadFile("schemas/" + kind + ".json")
}

// Schema is the part of JSON Schema the input schemas use: types (a name or
// a list, "null" for a value that may be absent), object properties,
// additionalProperties (false, or the schema of a map's values), array
// items, a format and a description.
type Schema struct {
	Title       string             `json:"title"`
	Description string             `json:"description"`
	Type        any                `json:"type"`
	Format      string             `json:"format"`
	Properties  map[string]*Schema `json:"properties"`
	Items       *Schema            `json:"items"`
	// Additional is additionalProperties when it is a schema (a map's
	// values); Closed is true when it is false.
	Additional *Schema `json:"-"`
	Closed     bool    `json:"-"`
}

// UnmarshalJSON reads additionalProperties as either false or a schema.
func (s *Schema) UnmarshalJSON(b []byte) error {
	type plain Schema
	var aux struct {
		plain
		AdditionalProperties json.RawMessage `json:"additionalProperties"`
	}
	dec := json.NewDecoder(bytes.NewReader(b))
	if err := dec.Decode(&aux); err != nil {
		return err
	}
	*s = Schema(aux.plain)
	switch ap := bytes.TrimSpace(aux.AdditionalProperties); {
	case len(ap) == 0, string(ap) == "true":
	case string(ap) == "false":
		s.Closed = true
	default:
		s.Additional = &Schema{}
		return json.Unmarshal(ap, s.Additional)
	}
	return nil
}

// InputSchema parses the input schema of one subject kind.
func InputSchema(kind string) (*Schema, error) {
	b, err := InputSchemaJSON(kind)
	if err != nil {
		return nil, err
	}
	var s Schema
	if err := json.Unmarshal(b, &s); err != nil {
		return nil, fmt.Errorf("schemas/%s.json: %w", kind, err)
	}
	return &s, nil
}

// Types lists the schema's type names ("string", "null", ...).
func (s *Schema) Types() []string {
	switch t := s.Type.(type) {
	case string:
		return []string{t}
	case []any:
		out := make([]string, 0, len(t))
		for _, x := range t {
			if n, ok := x.(string); ok {
				out = append(out, n)
			}
		}
		return out
	}
	return nil
}

// Field is one line of an input schema as a committee reads it.
type Field struct {
	Path        string // care.unobserved[].days; a map's keys are {KEY}
	Type        string // string, number, integer, boolean, object, list, or "… or null"
	Description string
}

// Fields flattens the schema into one line per field, depth first, in
// name order.
func (s *Schema) Fields() []Field {
	var out []Field
	var walk func(path string, s *Schema)
	walk = func(path string, s *Schema) {
		if path != "" && !strings.HasSuffix(path, "[]") {
			out = append(out, Field{Path: path, Type: s.typeText(), Description: s.Description})
		}
		if s.Items != nil {
			walk(path+"[]", s.Items)
			return
		}
		names := make([]string, 0, len(s.Properties))
		for n := range s.Properties {
			names = append(names, n)
		}
		sort.Strings(names)
		for _, n := range names {
			p := n
			if path != "" {
				p = path + "." + n
			}
			walk(p, s.Properties[n])
		}
		if s.Additional != nil {
			walk(path+".{KEY}", s.Additional)
		}
	}
	walk("", s)
	return out
}

func (s *Schema) typeText() string {
	var parts []string
	for _, t := range s.Types() {
		switch {
		case t == "array" && s.Items != nil:
			t = "list of " + strings.TrimSuffix(s.Items.typeText(), " or null") + "s"
		case t == "array":
			t = "list"
		case t == "string" && s.Format == "date":
			t = "day (YYYY-MM-DD)"
		case t == "object" && s.Additional != nil:
			t = "map"
		}
		parts = append(parts, t)
	}
	if len(parts) == 0 {
		return "any"
	}
	return strings.Join(parts, " or ")
}

// Validate checks a document (plain JSON values: map[string]any, []any,
// string, float64, int, bool, nil) against the schema and returns one
// problem per mismatch as "path: reason".
func (s *Schema) Validate(v any) []string {
	var out []string
	s.validate("input", v, &out)
	return out
}

func (s *Schema) validate(path string, v any, out *[]string) {
	types := s.Types()
	got := jsonType(v)
	if len(types) > 0 && !slices.Contains(types, got) && !(got == "integer" && slices.Contains(types, "number")) {
		if !(got == "number" && slices.Contains(types, "integer") && isWhole(v)) {
			*out = append(*out, fmt.Sprintf("%s: is %s, the schema says %s", path, got, strings.Join(types, " or ")))
			return
		}
	}
	switch x := v.(type) {
	case map[string]any:
		for k, e := range x {
			switch p := s.Properties[k]; {
			case p != nil:
				p.validate(path+"."+k, e, out)
			case s.Additional != nil:
				s.Additional.validate(path+"."+k, e, out)
			case s.Closed:
				*out = append(*out, fmt.Sprintf("%s.%s: not in the schema", path, k))
			}
		}
	case []any:
		if s.Items != nil {
			for i, e := range x {
				s.Items.validate(fmt.Sprintf("%s[%d]", path, i), e, out)
			}
		}
	case []string:
		if s.Items != nil {
			for i, e := range x {
				s.Items.validate(fmt.Sprintf("%s[%d]", path, i), e, out)
			}
		}
	}
}

func jsonType(v any) string {
	switch v.(type) {
	case nil:
		return "null"
	case string:
		return "string"
	case bool:
		return "boolean"
	case int, int64:
		return "integer"
	case float64:
		return "number"
	case map[string]any:
		return "object"
	case []any, []string:
		return "array"
	}
	return fmt.Sprintf("%T", v)
}

func isWhole(v any) bool {
	f, ok := v.(float64)
	return ok && f == float64(int64(f))
}
