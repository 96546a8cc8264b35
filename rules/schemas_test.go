package rules

import (
	"testing"

	"github.com/google/go-cmp/cmp"
)

func TestInputSchemaValidate(t *testing.T) {
	s, err := InputSchema("enclosure")
	if err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name string
		doc  map[string]any
		want []string
	}{
		{"good", map[string]any{"kind": "enclosure", "id": "E1", "name": nil, "ref": "enclosures.csv:2",
			"care": map[string]any{"unobserved": []any{map[string]any{"from": "2026-01-02", "until": "2026-01-03", "days": 2}}}}, nil},
		{"misspelt field", map[string]any{"kind": "enclosure", "id": "E1",
			"care": map[string]any{"unobsrved": []any{}}}, []string{"input.care.unobsrved: not in the schema"}},
		{"wrong type", map[string]any{"kind": "enclosure", "id": "E1",
			"care": map[string]any{"unobserved": []any{map[string]any{"days": "two"}}}}, []string{"input.care.unobserved[0].days: is string, the schema says integer"}},
		{"null where none may be", map[string]any{"kind": "enclosure", "id": nil}, []string{"input.id: is null, the schema says string"}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if diff := cmp.Diff(tt.want, s.Validate(tt.doc)); diff != "" {
				t.Errorf("problems (-want +got):\n%s", diff)
			}
		})
	}
}

func TestInputSchemaFields(t *testing.T) {
	s, err := InputSchema("site")
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]string{}
	for _, f := range s.Fields() {
		got[f.Path] = f.Type
	}
	want := map[string]string{
		"cold.days_at_or_below_frostbite_limit":            "list of objects",
		"cold.days_at_or_below_frostbite_limit[].on":       "day (YYYY-MM-DD)",
		"cold.days_at_or_below_frostbite_limit[].wind_kmh": "number or null",
		"ref": "string or null",
	}
	for path, typ := range want {
		if got[path] != typ {
			t.Errorf("%s: type %q, want %q", path, got[path], typ)
		}
	}
	if _, err := InputSchema("cage"); err == nil {
		t.Error("a kind without a schema gave no error")
	}
}
