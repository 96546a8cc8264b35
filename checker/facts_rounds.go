package checker

import (
	"cmp"
	"slices"

	"welfare/records"
)

// roundIndex is what the builders reading the care rounds take from them,
// gathered in one pass over the rounds (roundIndex): a year of a large
// colony is millions of rounds, and reading each round's answers costs more
// than everything a builder then does with them, so the rounds are read
// once, not once per builder. Ids are keys of the rounds' table of strings
// (strs); the entries of an enclosure's own rounds are under its key in
// side 0, a building round's under the building's key in side 1.
type roundIndex struct {
	strs []string
	// seen: bit 1<<side set when the key has a round up to the period's end.
	seen []uint8
	// first is the day of the key's first round up to the period's end.
	first [2][]records.Day
	// cleaned are the key's rounds up to the period's end that cleaned,
	// sorted by day, then ref (facts_cleaning.go).
	cleaned [2][][]int32
	// bedding are the days before the period a round of the key added
	// bedding, sorted; the period's are marked in the care index
	// (facts_cold.go).
	bedding [2][][]records.Day
	// events are the rounds of the period that found water empty or frozen
	// or raised a health concern, in the rounds' order (facts_care.go).
	events []int32
	// concerns are the rounds of any day that name a concern animal, in the
	// rounds' order (facts_records.go).
	concerns []int32
}

// roundIndex reads the care rounds once for every builder that needs them
// (made on first use; see roundIndex the type). The care index (careDays)
// is filled in the same pass.
func (f *facts) roundIndex() *roundIndex {
	if f.rix != nil {
		return f.rix
	}
	rounds := f.rounds
	strs := rounds.Strings()
	nk := len(strs)
	ix := &roundIndex{strs: strs, seen: make([]uint8, nk)}
	for side := range 2 {
		ix.first[side] = make([]records.Day, nk)
	}
	from, to := f.period.From, f.period.To
	c := &careDays{from: from, n: int(to-from) + 1, enc: map[string][]dayCare{}, bld: map[string][]dayCare{}}
	careOf := [2][][]dayCare{make([][]dayCare, nk), make([][]dayCare, nk)}
	// The cleaning rounds, and the bedding rounds before the period, are
	// few: listed here, counted per key, and cut into one block per list
	// below.
	var cleanList, bedList []int32
	counts := [2][]int32{make([]int32, 2*nk), make([]int32, 2*nk)}
	for i := range rounds.Len() {
		k := rounds.Keys(i)
		if k.ConcernAnimal != 0 {
			ix.concerns = append(ix.concerns, int32(i))
		}
		d := rounds.Day(i)
		if d > to {
			continue
		}
		side, key := 0, k.Enclosure
		if key == 0 {
			side, key = 1, k.Building
		}
		ix.seen[key] |= 1 << side
		if first := &ix.first[side][key]; *first == 0 || d < *first {
			*first = d
		}
		a := rounds.Answers(i)
		if a.Cleaned.IsYes() {
			counts[0][side*nk+int(key)]++
			cleanList = append(cleanList, int32(i))
		}
		if d < from {
			if a.BeddingAdded.IsYes() {
				counts[1][side*nk+int(key)]++
				bedList = append(bedList, int32(i))
			}
			continue
		}
		days := careOf[side][key]
		if days == nil {
			days = make([]dayCare, c.n)
			careOf[side][key] = days
		}
		dc := &days[d-from]
		dc.observed = dc.observed || a.Observed.IsYes()
		dc.fed = dc.fed || a.Fed.IsYes() || (a.HasFeed && a.FeedG > 0)
		dc.bedding = dc.bedding || a.BeddingAdded.IsYes()
		if a.Water != "" && a.Water != "not_checked" && dc.waterChecks < 255 {
			dc.waterChecks++
		}
		if a.Water == "empty" || a.Water == "frozen" || a.HealthConcern.IsYes() {
			ix.events = append(ix.events, int32(i))
		}
	}
	for key, id := range strs {
		if days := careOf[0][key]; days != nil {
			c.enc[id] = days
		}
		if days := careOf[1][key]; days != nil {
			c.bld[id] = days
		}
	}
	f.care = c
	ix.cleaned = cutByKey(rounds, nk, counts[0], cleanList, func(i int32) int32 { return i })
	ix.bedding = cutByKey(rounds, nk, counts[1], bedList, func(i int32) records.Day { return rounds.Day(int(i)) })
	byDayRef := func(a, b int32) int {
		if da, db := rounds.Day(int(a)), rounds.Day(int(b)); da != db {
			return cmp.Compare(da, db)
		}
		return rounds.CompareRefs(int(a), int(b))
	}
	for side := range 2 {
		for _, c := range ix.cleaned[side] {
			if len(c) > 1 && !slices.IsSortedFunc(c, byDayRef) {
				slices.SortFunc(c, byDayRef)
			}
		}
		for _, ds := range ix.bedding[side] {
			if !slices.IsSorted(ds) {
				slices.Sort(ds)
			}
		}
	}
	f.rix = ix
	return ix
}

// cutByKey gives each key's entries of list (round indexes, in the rounds'
// order), made by val, as slices of one block: counts are the entries per
// side and key (side*nk+key), as the pass over the rounds counted them.
func cutByKey[T any](rounds *records.CareRounds, nk int, counts []int32, list []int32, val func(int32) T) [2][][]T {
	var out [2][][]T
	block := make([]T, 0, len(list))
	for side := range 2 {
		out[side] = make([][]T, nk)
	}
	for key := range nk {
		for side := range 2 {
			if n := int(counts[side*nk+key]); n > 0 {
				out[side][key] = block[len(block) : len(block) : len(block)+n]
				block = block[:len(block)+n]
			}
		}
	}
	for _, i := range list {
		k := rounds.Keys(int(i))
		side, key := 0, k.Enclosure
		if key == 0 {
			side, key = 1, k.Building
		}
		out[side][key] = append(out[side][key], val(i))
	}
	return out
}
