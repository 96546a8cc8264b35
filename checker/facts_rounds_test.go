package checker

import (
	"bytes"
	"os"
	"reflect"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
	"welfare/rules"
)

// A loaded set keeps its care rounds in the compact store; a set made by
// hand lists them in Care. The same rounds either way give the same facts,
// document for document, and the same care coverage.
func TestHandMadeRoundsGiveTheFactsOfLoadedOnes(t *testing.T) {
	lim, err := rules.LoadLimits(bytes.NewReader(rules.DefaultLimits()), "limits.yaml")
	if err != nil {
		t.Fatal(err)
	}
	loaded, err := records.Load(os.DirFS("../testdata/demo/records"), records.Options{Species: lim.SpeciesCodes()})
	if err != nil {
		t.Fatal(err)
	}
	// The hand-made copy: every exported field, and the rounds as rows.
	hand := &records.Set{}
	hv, lv := reflect.ValueOf(hand).Elem(), reflect.ValueOf(loaded).Elem()
	for i := range hv.NumField() {
		if hv.Type().Field(i).IsExported() {
			hv.Field(i).Set(lv.Field(i))
		}
	}
	hand.Care = loaded.CareRounds().Rounds()
	if len(hand.Care) < 100 {
		t.Fatalf("the demo has %d care rounds; want a real sample", len(hand.Care))
	}
	from, _ := records.ParseDay("2026-01-01")
	to, _ := records.ParseDay("2026-01-31")
	build := func(set *records.Set) *facts {
		f := newFacts(set, lim, Period{From: from, To: to})
		for _, d := range domains {
			d.facts(f)
		}
		f.addExtra()
		return f
	}
	a, b := build(loaded), build(hand)
	if d := cmp.Diff(plainDocs(a), plainDocs(b)); d != "" {
		t.Errorf("facts of the loaded set (-) and the hand-made one (+):\n%s", d)
	}
	if a.coverage != b.coverage || a.coverage.OccupiedDays == 0 {
		t.Errorf("care coverage: loaded %+v, hand-made %+v", a.coverage, b.coverage)
	}
	// The rounds reach the facts: the demo plants care findings.
	care := 0
	for _, doc := range a.docs["enclosure"] {
		if c, ok := doc["care"].(map[string]any); ok {
			for _, k := range []string{"unobserved", "unfed", "water_unavailable", "concerns"} {
				if l, ok := c[k].([]any); ok {
					care += len(l)
				}
			}
		}
	}
	if care == 0 {
		t.Error("no care facts in the demo's January")
	}
}
