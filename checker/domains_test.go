package checker

import (
	"maps"
	"reflect"
	"slices"
	"strings"
	"testing"

	"welfare/records"
	"welfare/records/demo"
	"welfare/rules"
)

// TestLanesBuildTheSameFacts builds the facts of both demo seasons and of
// a generated year twice, the builders of lane0 and lane1 one after the
// other and on two lanes (buildFactsIn), and requires the same
// documents, resolved, of every kind and subject, and the same report
// figures. The generated year must have enclosures whose documents got
// sections from both lanes (care on lane0, cold on lane1), so joining a
// subject's document is tested, not only taking one.
func TestLanesBuildTheSameFacts(t *testing.T) {
	lim, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	sets := map[string]*records.Set{}
	for _, name := range slices.Sorted(maps.Keys(demo.Seasons)) {
		set, err := records.Load(demo.Seasons[name].FS(), records.Options{Species: lim.SpeciesCodes()})
		if err != nil {
			t.Fatal(err)
		}
		sets["demo "+name] = set
	}
	sets["generated-150"], _ = generatedSet(t, 150, lim)
	used := map[lane]bool{}
	for _, d := range domains {
		used[d.lane] = true
	}
	if !used[lane0] || !used[lane1] {
		t.Fatalf("lanes %v: the builders do not run on both lanes", used)
	}
	for name, set := range sets {
		from, to := recordSpan(set)
		build := func(lanes int) *facts {
			f := newFacts(set, lim, Period{From: from, To: to})
			buildFactsIn(f, nil, lanes)
			return f
		}
		one, two := build(1), build(2)
		if !reflect.DeepEqual(one.coverage, two.coverage) || !reflect.DeepEqual(one.weather, two.weather) {
			t.Errorf("%s: the report's care coverage or weather differ", name)
		}
		if got, want := slices.Sorted(maps.Keys(two.docs)), slices.Sorted(maps.Keys(one.docs)); !slices.Equal(got, want) {
			t.Fatalf("%s: kinds %v on two lanes, %v on one", name, got, want)
		}
		joined := 0
		for kind := range one.docs {
			a, b := one.inputs(kind), two.inputs(kind)
			if len(a) != len(b) {
				t.Errorf("%s: %d %s documents on two lanes, %d on one", name, len(b), kind, len(a))
				continue
			}
			for i := range a {
				if !reflect.DeepEqual(resolveDoc(a[i]), resolveDoc(b[i])) {
					t.Errorf("%s: %s %v differs on two lanes", name, kind, a[i]["id"])
				}
				// A document with a care section (lane0) and a cold one
				// (lane1) was joined.
				if _, s := b[i]["care"]; s && kind == "enclosure" {
					if _, c := b[i]["cold"]; c {
						joined++
					}
				}
			}
		}
		if name == "generated-150" && joined == 0 {
			t.Errorf("%s: no enclosure's document has sections from both lanes", name)
		}
	}
}

// TestRoundsReadAfterTheyGoPanics: a fact builder moved to afterRounds
// that reads the care rounds fails at once with a message naming the
// lanes, not with an empty index or a nil dereference.
func TestRoundsReadAfterTheyGoPanics(t *testing.T) {
	defer func() {
		if r, _ := recover().(string); !strings.Contains(r, "lane0 or lane1") {
			t.Fatalf("recovered %q, want the lanes named", r)
		}
	}()
	f := &facts{}
	f.roundIndex()
}
