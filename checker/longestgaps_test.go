package checker

import (
	"fmt"
	"math/rand/v2"
	"slices"
	"sort"
	"testing"

	"welfare/records"
)

// longestGaps keeps what a stable sort of every gap by length, cut after n
// but for the overdue ones, keeps, in the same order (the way the warm
// figures were listed before it).
func TestLongestGapsAsStableSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 11))
	for trial := range 200 {
		gaps := make([]CleaningGap, rng.IntN(400))
		for i := range gaps {
			from := records.Day(rng.IntN(300))
			days := 1 + rng.IntN(1+trial%40)
			gaps[i] = CleaningGap{Enclosure: fmt.Sprintf("E%03d", rng.IntN(50)), From: from, Until: from + records.Day(days),
				Days: days, Overdue: rng.IntN(20) == 0}
		}
		overdue := func(g *CleaningGap) bool { return g.Days > 30 && g.Enclosure < "E010" }
		n := rng.IntN(60)
		// The reference: mark, sort stably by length, keep.
		ref := slices.Clone(gaps)
		for i := range ref {
			ref[i].Overdue = ref[i].Overdue || overdue(&ref[i])
		}
		sort.SliceStable(ref, func(i, j int) bool { return ref[i].Days > ref[j].Days })
		var want []CleaningGap
		for i, g := range ref {
			if g.Overdue || i < n {
				want = append(want, g)
			}
		}
		before := slices.Clone(gaps)
		got := longestGaps(gaps, overdue, n)
		if !slices.Equal(got, want) {
			t.Fatalf("trial %d (%d gaps, n %d): got %d gaps, want %d\n got %v\nwant %v", trial, len(gaps), n, len(got), len(want), got, want)
		}
		if !slices.Equal(gaps, before) {
			t.Fatalf("trial %d: the gaps given were changed", trial)
		}
	}
}
