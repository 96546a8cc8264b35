package checker

import (
	"maps"
	"slices"
	"testing"

	"welfare/records"
	"welfare/records/demo"
	"welfare/rules"
)

// demoFacts computes the facts of each demo season (the January and the
// July of the invented station) with the default limits, as Check does.
func demoFacts(t *testing.T) []*facts {
	t.Helper()
	lim, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	var out []*facts
	for _, name := range slices.Sorted(maps.Keys(demo.Seasons)) {
		set, err := records.Load(demo.Seasons[name].FS(), records.Options{Species: lim.SpeciesCodes()})
		if err != nil {
			t.Fatal(err)
		}
		from, to := recordSpan(set)
		f := newFacts(set, lim, Period{From: from, To: to})
		for _, d := range domains {
			d.facts(f)
		}
		out = append(out, f)
	}
	return out
}

// TestFactsMatchInputSchemas holds every input document the demo gives the
// rules to the schema of its kind: a field the facts add without a schema
// entry, or of another type, fails here (and a rule reading a field the
// schema lacks fails to compile).
func TestFactsMatchInputSchemas(t *testing.T) {
	all := demoFacts(t)
	for _, kind := range SubjectKinds {
		if kind == correctionKind {
			continue // built in the second pass from findings: TestCorrectionFactsMatchSchema
		}
		t.Run(kind, func(t *testing.T) {
			s, err := rules.InputSchema(kind)
			if err != nil {
				t.Fatal(err)
			}
			var docs []map[string]any
			for _, f := range all {
				docs = append(docs, resolveDocs(f.inputs(kind))...)
			}
			if len(docs) == 0 {
				t.Fatalf("the demo has no %s documents to check", kind)
			}
			var problems []string
			for _, d := range docs {
				for _, p := range s.Validate(d) {
					if !slices.Contains(problems, p) {
						problems = append(problems, p)
					}
				}
			}
			for _, p := range problems[:min(len(problems), 20)] {
				t.Errorf("%s: %s", kind, p)
			}
		})
	}
}

// TestSubjectKindsHaveSchemas: the kinds a package may name are exactly
// the kinds with an input schema.
func TestSubjectKindsHaveSchemas(t *testing.T) {
	got := rules.InputKinds()
	want := slices.Sorted(slices.Values(SubjectKinds))
	if !slices.Equal(got, want) {
		t.Errorf("schemas for %v, subject kinds %v", got, want)
	}
}
