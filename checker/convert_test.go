package checker

import (
	"encoding/json"
	"math"
	"testing"

	"github.com/open-policy-agent/opa/v1/ast"

	"welfare/records"
	"welfare/rules"
)

// sameAsOPA fails unless the converter gives doc the value
// ast.InterfaceToValue gives it: Equal, Compare 0 and the same text.
func sameAsOPA(t *testing.T, c *converter, doc map[string]any) {
	t.Helper()
	want, err := ast.InterfaceToValue(resolveDoc(doc))
	if err != nil {
		t.Fatal(err)
	}
	got, err := c.document(doc)
	if err != nil {
		t.Fatal(err)
	}
	if !ast.NewTerm(got).Equal(ast.NewTerm(want)) || got.Compare(want) != 0 || want.Compare(got) != 0 || got.Hash() != want.Hash() || got.String() != want.String() {
		t.Fatalf("subject %v: converted\n%s\nwant\n%s", doc["id"], shorten(got.String(), 2000), shorten(want.String(), 2000))
	}
}

// TestConverterMatchesOPAOnFacts: every subject document of both demo
// seasons and of a generated year converts to the value OPA's own
// conversion gives, one converter going through the subjects in the order
// Evaluate gives them (so shared parts are reused across subjects).
func TestConverterMatchesOPAOnFacts(t *testing.T) {
	n := 0
	for _, f := range documentSets(t) {
		for _, kind := range SubjectKinds {
			c := newConverter()
			for _, doc := range f.inputs(kind) {
				sameAsOPA(t, c, doc)
				n++
			}
		}
	}
	if n < 500 {
		t.Fatalf("only %d documents compared", n)
	}
	// The correction documents, built from findings in the second pass.
	d := func(s string) records.Day { return followDay(t, s) }
	set := &records.Set{CorrectiveActions: []records.CorrectiveAction{
		{Ref: "corrective_actions.csv:2", Check: "care.water.unavailable", Subject: "S2-11", FoundOn: d("2025-12-09"),
			Plan: "heated drinker", DueOn: d("2025-12-19"), ClosedOn: d("2026-01-05")},
	}}
	prev := &Previous{Findings: []Finding{{Check: "care.water.unavailable", Subject: "S2-11", On: d("2025-12-09"), Severity: Significant, Message: "frozen"}}}
	found := []Finding{{Check: "care.water.unavailable", Subject: "S2-11", On: d("2026-01-03"), Until: d("2026-01-07"),
		Severity: Significant, Evidence: []records.Ref{"daily_care.csv:9"}}}
	docs := correctionFacts(set, prev, Period{From: d("2026-01-01"), To: d("2026-01-31")}, found)
	if len(docs) == 0 {
		t.Fatal("no correction documents")
	}
	c := newConverter()
	for _, doc := range docs {
		sameAsOPA(t, c, doc)
	}
}

// TestConverterValues: each kind of value the facts use, and the edge
// cases of numbers, converts as OPA converts it.
func TestConverterValues(t *testing.T) {
	shared := map[string]any{"from": "2026-07-01", "days": 2}
	list := []any{"a", 1.5}
	docs := []map[string]any{
		{"id": "A", "null": nil, "t": true, "f": false, "s": "", "long": string(make([]byte, 200))},
		{"id": "B", "ints": []any{0, -1, 1, 512, 513, -2, math.MaxInt, math.MinInt}},
		{"id": "C", "floats": []any{0.0, math.Copysign(0, -1), 0.1, 1e21, 1e-7, 2.0, -2.5, 123456789.125, math.MaxFloat64, math.SmallestNonzeroFloat64}},
		{"id": "D", "a": shared, "b": shared, "l": []any{list, list, list[:1], list[1:]}, "nested": map[string]any{"x": shared}},
		{"id": "E", "a": shared, "empty": []any{}, "emptymap": map[string]any{}, "nilmap": map[string]any(nil), "nilslice": []any(nil)},
		{"id": "F", "strs": []string{"x", "y"}, "json": json.Number("12.50"), "i64": int64(7), "sm": map[string]string{"k": "v"}},
		{"id": "G", "struct": struct {
			A int `json:"a"`
		}{3}},
	}
	c := newConverter()
	for _, d := range docs {
		sameAsOPA(t, c, d)
	}
	// The same number twice, the second from the converter's table.
	c2 := newConverter()
	sameAsOPA(t, c2, map[string]any{"a": 36.6, "b": 36.6, "z": math.Copysign(0, -1), "y": 0.0})
}

// TestConverterSharesTerms: a map given in two places of a document, and
// in the document of the subject after, is one term.
func TestConverterSharesTerms(t *testing.T) {
	run := map[string]any{"from": "2026-07-01", "days": 2}
	c := newConverter()
	v1, err := c.document(map[string]any{"id": "E-1", "days": []any{map[string]any{"run": run}, map[string]any{"run": run}}})
	if err != nil {
		t.Fatal(err)
	}
	days := v1.(ast.Object).Get(ast.StringTerm("days")).Value.(*ast.Array)
	r0 := days.Elem(0).Value.(ast.Object).Get(ast.StringTerm("run"))
	r1 := days.Elem(1).Value.(ast.Object).Get(ast.StringTerm("run"))
	if r0 != r1 {
		t.Error("a map given twice in one document was converted twice")
	}
	v2, err := c.document(map[string]any{"id": "E-2", "run": run})
	if err != nil {
		t.Fatal(err)
	}
	if v2.(ast.Object).Get(ast.StringTerm("run")) != r0 {
		t.Error("a map given to the subject before was converted again")
	}
	// Two subjects later it is converted afresh (the converter keeps the
	// containers of one subject back only), and still the same value.
	c.document(map[string]any{"id": "E-3"})
	c.document(map[string]any{"id": "E-4"})
	v5, err := c.document(map[string]any{"id": "E-5", "run": run})
	if err != nil {
		t.Fatal(err)
	}
	r5 := v5.(ast.Object).Get(ast.StringTerm("run"))
	if r5 == r0 || !r5.Equal(r0) {
		t.Errorf("after two other subjects: same term %v, equal %v", r5 == r0, r5.Equal(r0))
	}
}

// BenchmarkConvertGenerated converts every subject document of a generated
// year (1,000 animals) with OPA's conversion and with the converter, one
// goroutine, subjects in the order Evaluate gives them.
//
//	go test ./checker -run '^$' -bench ConvertGenerated -benchmem
func BenchmarkConvertGenerated(b *testing.B) {
	lim, err := rules.Default()
	if err != nil {
		b.Fatal(err)
	}
	set, _ := generatedSet(b, 1000, lim)
	from, to := recordSpan(set)
	f := newFacts(set, lim, Period{From: from, To: to})
	for _, d := range domains {
		d.facts(f)
	}
	var docs []map[string]any
	for _, kind := range SubjectKinds {
		docs = append(docs, f.inputs(kind)...)
	}
	b.Run("opa", func(b *testing.B) {
		b.ReportAllocs()
		defer reportCPU(b)()
		for b.Loop() {
			for _, d := range docs {
				if _, err := ast.InterfaceToValue(d); err != nil {
					b.Fatal(err)
				}
			}
		}
	})
	b.Run("converter", func(b *testing.B) {
		b.ReportAllocs()
		defer reportCPU(b)()
		for b.Loop() {
			c := newConverter()
			for _, d := range docs {
				if _, err := c.document(d); err != nil {
					b.Fatal(err)
				}
			}
		}
	})
}
