package checker

import (
	"context"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// TestOneQueryPerKindAsPackageByPackage: on a generated year, every kind's
// findings evaluated in one query per subject (kindQuery) are those of
// one evaluation per package, in the same order; and each package's time
// is charged to its own budget.
func TestOneQueryPerKindAsPackageByPackage(t *testing.T) {
	if testing.Short() {
		t.Skip("generates a year of records")
	}
	lim := defaultLimits(t)
	grouped := shippedEngine(t, lim)
	for _, kind := range []string{"animal", "enclosure", "staff", "site", "facility", "building"} {
		if grouped.groups[kind] == nil {
			t.Errorf("the %s packages are not evaluated in one query", kind)
		}
	}
	apart := *grouped
	apart.groups = nil
	set, _ := generatedSet(t, 150, lim)
	from, to := recordSpan(set)
	f := newFacts(set, lim, Period{From: from, To: to})
	buildFacts(f, nil)
	ctx, cancel := grouped.startRun(context.Background(), nil)
	defer cancel()
	found := 0
	for _, kind := range grouped.Kinds() {
		inputs := f.inputs(kind)
		if len(inputs) == 0 {
			continue
		}
		got, err := grouped.Evaluate(ctx, kind, inputs)
		if err != nil {
			t.Fatal(err)
		}
		want, err := apart.Evaluate(context.Background(), kind, inputs)
		if err != nil {
			t.Fatal(err)
		}
		if diff := cmp.Diff(want, got); diff != "" {
			t.Errorf("%s findings (-one query per package +one per subject):\n%s", kind, diff)
		}
		found += len(got)
		for _, q := range grouped.kinds[kind] {
			if runOf(ctx).spentOn(q) <= 0 {
				t.Errorf("%s: no time charged to its budget", q.name)
			}
		}
	}
	if found == 0 {
		t.Error("no findings at all: nothing compared")
	}
}
