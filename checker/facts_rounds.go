package checker

import (
	"cmp"
	"slices"
	"strings"
	"sync"

	"welfare/records"
)

// roundIndex is what the builders reading the care rounds take from them,
// gathered in one pass over the rounds (facts.roundIndex): a year of a
// large colony is millions of rounds, and reading each round's answers
// costs more than everything a builder then does with them, so the rounds
// are read once, not once per builder.
type roundIndex struct {
	// places are the enclosures and buildings that have a round up to the
	// period's end, in the order of their first round.
	places []roundPlace
	// events are the rounds of the period that found water empty or frozen
	// or raised a health concern, in the rounds' order (facts_care.go).
	events []int32
	// concerns are the rounds of any day that name a concern animal, in the
	// rounds' order (facts_records.go).
	concerns []int32
	// staff are the rounds of the period counted per person and day
	// (facts_staff.go).
	staff *staffRounds
}

// roundPlace is what the rounds up to the period's end recorded for one
// enclosure (its own rounds) or one building (its building rounds).
type roundPlace struct {
	id       string
	building bool
	// first is the day of the first round.
	first records.Day
	// care is the care index's days of the period (nil: no round in the
	// period; facts_care.go).
	care []dayCare
	// cleanedRef are the refs of the rounds that cleaned, sorted by day,
	// then ref, and cleanedOn their days (facts_cleaning.go). The refs are
	// made while the pass reads the round: read later, each would be a
	// round read again from anywhere in the store.
	cleanedRef []records.Ref
	cleanedOn  []records.Day
	// bedding are the days before the period a round added bedding, sorted;
	// the period's are marked in care (facts_cold.go).
	bedding []records.Day
}

// roundIndex reads the care rounds once for every builder that needs them
// (made on first use; see roundIndex the type). The care index (careDays)
// is filled in the same pass. The pass is on two goroutines: the staff
// counts and the concerns need only each round's keys and day, not its
// answers, and take a third of it on the generated years.
func (f *facts) roundIndex() *roundIndex {
	if f.rix != nil {
		return f.rix
	}
	rounds := f.rounds
	if rounds == nil {
		// A builder running after the rounds go (domains.go, afterRounds)
		// must not read them: a programming error, not the records'.
		panic("checker: the care rounds were read after they were let go; run that fact builder on lane0 or lane1")
	}
	strs := rounds.Strings()
	ix := &roundIndex{staff: f.newStaffRounds()}
	from, to := f.period.From, f.period.To
	n := int(to-from) + 1
	// Each place is found by its key in the rounds' table of strings (per
	// side: an enclosure's own rounds, a building's), then held as an index
	// into places, so the per-place data grows with the places, not with
	// the table (which holds every note too).
	placeOf := [2][]int32{make([]int32, len(strs)), make([]int32, len(strs))}
	place := func(k records.CareKeys) (side int, key uint32) {
		if k.Enclosure != 0 {
			return 0, k.Enclosure
		}
		return 1, k.Building
	}
	// The cleaning rounds, and the bedding rounds before the period, are
	// few: listed here, counted per place, and cut into one block per list
	// below.
	// Each listed with its place (and day), so the lists are cut and
	// sorted without reading the rounds again.
	type listed struct {
		place int32
		day   records.Day
		ref   records.Ref
	}
	var cleanList, bedList blockList[listed]
	var counts [][2]int32
	// The staff counts and the concerns are read on a goroutine of their
	// own, over the rounds in the same order: they fill fields the rest
	// of the pass does not touch, so the index is the same.
	var wg sync.WaitGroup
	wg.Go(func() {
		for i := range rounds.Len() {
			k := rounds.Keys(i)
			if k.ConcernAnimal != 0 {
				ix.concerns = append(ix.concerns, int32(i))
			}
			if d := rounds.Day(i); d >= from && d <= to {
				ix.staff.visit(i, k, d)
			}
		}
	})
	for i := range rounds.Len() {
		k := rounds.Keys(i)
		d := rounds.Day(i)
		if d > to {
			continue
		}
		side, key := place(k)
		pi := placeOf[side][key]
		if pi == 0 {
			ix.places = append(ix.places, roundPlace{id: strs[key], building: side == 1, first: d})
			counts = append(counts, [2]int32{})
			pi = int32(len(ix.places))
			placeOf[side][key] = pi
		}
		p := &ix.places[pi-1]
		if d < p.first {
			p.first = d
		}
		a := rounds.Answers(i)
		if a.Cleaned.IsYes() {
			counts[pi-1][0]++
			cleanList.add(listed{pi - 1, d, rounds.Ref(i)})
		}
		if d < from {
			if a.BeddingAdded.IsYes() {
				counts[pi-1][1]++
				bedList.add(listed{pi - 1, d, ""})
			}
			continue
		}
		if p.care == nil {
			p.care = make([]dayCare, n)
		}
		dc := &p.care[d-from]
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
	wg.Wait()
	// Each list cut into one block, a slice per place.
	cleaned := make([]records.Ref, 0, cleanList.n)
	cleanedOn := make([]records.Day, 0, cleanList.n)
	bedding := make([]records.Day, 0, bedList.n)
	for pi := range ix.places {
		p := &ix.places[pi]
		if c := int(counts[pi][0]); c > 0 {
			p.cleanedRef = cleaned[len(cleaned) : len(cleaned) : len(cleaned)+c]
			cleaned = cleaned[:len(cleaned)+c]
			p.cleanedOn = cleanedOn[len(cleanedOn) : len(cleanedOn) : len(cleanedOn)+c]
			cleanedOn = cleanedOn[:len(cleanedOn)+c]
		}
		if c := int(counts[pi][1]); c > 0 {
			p.bedding = bedding[len(bedding) : len(bedding) : len(bedding)+c]
			bedding = bedding[:len(bedding)+c]
		}
	}
	for _, b := range cleanList.blocks {
		for _, e := range b {
			p := &ix.places[e.place]
			p.cleanedRef, p.cleanedOn = append(p.cleanedRef, e.ref), append(p.cleanedOn, e.day)
		}
	}
	for _, b := range bedList.blocks {
		for _, e := range b {
			p := &ix.places[e.place]
			p.bedding = append(p.bedding, e.day)
		}
	}
	c := &careDays{from: from, n: n, enc: map[string][]dayCare{}, bld: map[string][]dayCare{}}
	for pi := range ix.places {
		p := &ix.places[pi]
		sortCleaned(p.cleanedRef, p.cleanedOn)
		if !slices.IsSorted(p.bedding) {
			slices.Sort(p.bedding)
		}
		if p.care != nil {
			if p.building {
				c.bld[p.id] = p.care
			} else {
				c.enc[p.id] = p.care
			}
		}
	}
	if f.care == nil {
		// A care index made before stays: the rounds may be gone since.
		f.care = c
	}
	f.rix = ix
	return ix
}

// sortCleaned sorts a place's cleaning rounds' refs (and their days
// alike) by day, then ref; they are most often in that order already.
func sortCleaned(refs []records.Ref, on []records.Day) {
	type entry struct {
		day records.Day
		ref records.Ref
	}
	byDayRef := func(a, b entry) int {
		if a.day != b.day {
			return cmp.Compare(a.day, b.day)
		}
		return strings.Compare(string(a.ref), string(b.ref))
	}
	sorted := true
	for j := 1; j < len(on) && sorted; j++ {
		sorted = byDayRef(entry{on[j-1], refs[j-1]}, entry{on[j], refs[j]}) <= 0
	}
	if sorted {
		return
	}
	es := make([]entry, len(refs))
	for j := range es {
		es[j] = entry{on[j], refs[j]}
	}
	slices.SortFunc(es, byDayRef)
	for j, e := range es {
		on[j], refs[j] = e.day, e.ref
	}
}

// blockList is a list grown in blocks of a fixed size, never copied: a
// list whose length a pass learns only at its end costs its size, not the
// copies and spare room of a slice grown by append.
type blockList[T any] struct {
	blocks [][]T
	n      int
}

const blockListSize = 4096

func (l *blockList[T]) add(v T) {
	k := len(l.blocks) - 1
	if k < 0 || len(l.blocks[k]) == cap(l.blocks[k]) {
		l.blocks = append(l.blocks, make([]T, 0, blockListSize))
		k++
	}
	l.blocks[k] = append(l.blocks[k], v)
	l.n++
}
