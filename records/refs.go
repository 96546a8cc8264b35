package records

import (
	"fmt"
	"runtime"
	"sync"
)

// loadedSet holds every file between reading and the cross-record rules.
type loadedSet struct {
	animals      *loaded[Animal]
	enclosures   *loaded[Enclosure]
	housing      *loaded[Housing]
	staff        *loaded[Staff]
	protocols    *loaded[Protocol]
	care         *loaded[CareRound]
	handling     *loaded[Handling]
	ppe          *loaded[PPECheck]
	weather      *loaded[Weather]
	work         *loaded[OutdoorWork]
	culls        *loaded[Cull]
	deaths       *loaded[Death]
	observations *loaded[Observation]
	treatments   *loaded[Treatment]
	litters      *loaded[Litter]
	environment  *loaded[EnvironmentReading]
	corrective   *loaded[CorrectiveAction]
	extra        []Problem // file-level problems that belong to no file read (a missing staff.csv)
}

// index is the set of accepted ids of one file, with what is known about
// the ids that are not there, so a dangling reference says why.
type index struct {
	file     string
	what     string // "in animals.csv", "a building in facility.yaml"
	present  bool
	failed   bool
	ids      map[string]bool
	rejected map[string]Ref
	fix      string // how to add a missing id, for sets not kept in a file of rows
}

func newIndex[T any](l *loaded[T]) *index {
	ix := &index{file: l.spec.name, what: "in " + l.spec.name, present: l.present, failed: l.count.Failed != "", ids: make(map[string]bool, len(l.rows)), rejected: l.rejected}
	for i := range l.rows {
		ix.ids[l.spec.id(&l.rows[i])] = true
	}
	return ix
}

// check returns the reason id is unknown, or "" when it is accepted.
func (ix *index) check(id string) string {
	if ix.ids[id] {
		return ""
	}
	why, fix := "", ix.fix
	switch {
	case !ix.present:
		why = fmt.Sprintf(" (%s is missing)", ix.file)
		fix = fmt.Sprintf("add %s with a row for it", ix.file)
	case ix.failed:
		why = fmt.Sprintf(" (%s could not be used)", ix.file)
		fix = fmt.Sprintf("fix the problem with %s first", ix.file)
	case ix.rejected[id] != "":
		why = fmt.Sprintf(" (its row %s was rejected)", ix.rejected[id])
		fix = "fix that row first"
	}
	if fix == "" {
		fix = fmt.Sprintf("add a row for it to %s, or correct the id", ix.file)
	}
	return fmt.Sprintf("%q is not %s%s: %s", id, ix.what, why, fix)
}

// nameSet is a set of ids defined in facility.yaml or seen in a file; fix
// says how a keeper adds a missing one.
func nameSet(what, fix string) *index {
	return &index{what: what, fix: fix, present: true, ids: map[string]bool{}}
}

// ref is one reference a row makes: the Go field naming the column, the id
// it names, and the set it must be in.
type ref struct {
	goName string
	id     string
	in     *index
}

// keep drops the rows whose references do not resolve (or that fail
// another cross-record rule), turning each into a problem. Rows are checked
// in file order, so a rule like "no overlap" sees only rows already kept.
func (l *loaded[T]) keep(check func(r *T) *cellError) {
	if l.plan == nil {
		return
	}
	n := 0
	for i := range l.rows {
		r := &l.rows[i]
		if ce := check(r); ce != nil {
			pr := l.problem(refLine(r), ce)
			if l.spec.day != nil {
				pr.Day = l.spec.day(r)
			}
			l.problems = append(l.problems, pr)
			l.count.Accepted--
			l.count.Rejected++
			if l.spec.id != nil {
				l.rejected[l.spec.id(r)] = rowRef(r)
			}
			continue
		}
		if n != i {
			l.rows[n] = *r
		}
		n++
	}
	clear(l.rows[n:]) // let dropped rows' strings go
	l.rows = l.rows[:n]
}

// len is the number of rows accepted so far.
func (l *loaded[T]) len() int {
	if l.store != nil {
		return l.store.Len()
	}
	return len(l.rows)
}

// keepRounds is keep for the care rounds, which are kept in their store:
// a round naming an id that is not in its set becomes a problem,
// positioned and dated as keep does. refs are the round's references in
// the order they are checked (Enclosure, Building, Staff, ConcernAnimal
// of CareKeys); each is resolved once per distinct id, a key of the
// store's table of strings, rather than once per round. The rounds are
// first searched for the first that fails, on every core at once; only
// from there on are they compacted, in order.
func keepRounds(l *loaded[CareRound], refs [4]ref) {
	st, ok := l.store.(*CareRounds)
	if l.plan == nil || !ok {
		return
	}
	strs := st.Strings()
	// A verdict per reference and key: 0 not looked up yet, 1 in its
	// set, 2 not. Each goroutine has its own.
	type known [4][]uint8
	newKnown := func() *known {
		var k known
		for f := range k {
			k[f] = make([]uint8, len(strs))
		}
		return &k
	}
	// fails is the reference round i fails, or -1.
	fails := func(kn *known, i int) int {
		k := st.Keys(i)
		for f, key := range [4]uint32{k.Enclosure, k.Building, k.Staff, k.ConcernAnimal} {
			if key == 0 {
				continue
			}
			v := kn[f][key]
			if v == 0 {
				v = 1
				if !refs[f].in.ids[strs[key]] {
					v = 2
				}
				kn[f][key] = v
			}
			if v == 2 {
				return f
			}
		}
		return -1
	}
	n := st.Len()
	parts := min(runtime.GOMAXPROCS(0), max(1, n>>16))
	firsts := make([]int, parts)
	var wg sync.WaitGroup
	for p := range parts {
		wg.Go(func() {
			kn := newKnown()
			firsts[p] = -1
			for i := n * p / parts; i < n*(p+1)/parts; i++ {
				if fails(kn, i) >= 0 {
					firsts[p] = i
					return
				}
			}
		})
	}
	wg.Wait()
	first := -1
	for _, i := range firsts {
		if i >= 0 {
			first = i
			break
		}
	}
	if first < 0 {
		return // every round's references resolve
	}
	kn := newKnown()
	st.retainFrom(first, func(i int) bool {
		f := fails(kn, i)
		if f < 0 {
			return true
		}
		r := refs[f]
		r.id = strs[st.Keys(i).key(f)]
		pr := l.problem(st.line(i), l.refs(r))
		pr.Day = st.Day(i)
		l.problems = append(l.problems, pr)
		l.count.Accepted--
		l.count.Rejected++
		return false
	})
}

// refs checks a row's references in order and reports the first that fails.
func (l *loaded[T]) refs(rs ...ref) *cellError {
	for _, r := range rs {
		if r.id == "" {
			continue
		}
		if why := r.in.check(r.id); why != "" {
			return &cellError{field: l.plan.rt.byGo[r.goName], column: l.plan.header(r.goName), value: r.id, reason: why, kind: KindUnknownRef}
		}
	}
	return nil
}

func (l *loaded[T]) cellErr(goName, value, reason string) *cellError {
	fi, ok := l.plan.rt.byGo[goName]
	if !ok {
		fi = -1
	}
	return &cellError{field: fi, column: l.plan.header(goName), value: value, reason: reason}
}

func rowRef(r any) Ref {
	switch r := r.(type) {
	case *Animal:
		return r.Ref
	case *Enclosure:
		return r.Ref
	case *Housing:
		return r.Ref
	case *Staff:
		return r.Ref
	case *Protocol:
		return r.Ref
	case *CareRound:
		return r.Ref
	case *Handling:
		return r.Ref
	case *PPECheck:
		return r.Ref
	case *Weather:
		return r.Ref
	case *OutdoorWork:
		return r.Ref
	case *Cull:
		return r.Ref
	case *Death:
		return r.Ref
	case *Observation:
		return r.Ref
	case *Treatment:
		return r.Ref
	case *Litter:
		return r.Ref
	case interface{ rowRef() Ref }:
		return r.rowRef()
	}
	return ""
}

func refLine(r any) int {
	s := string(rowRef(r))
	i := len(s)
	for i > 0 && s[i-1] >= '0' && s[i-1] <= '9' {
		i--
	}
	n := 0
	for _, c := range s[i:] {
		n = n*10 + int(c-'0')
	}
	return n
}

// crossCheck applies the rules that span files, in dependency order so that
// a rejected enclosure also rejects the rows that name it.
func (ld *loadedSet) crossCheck(fac *Facility) {
	buildings := nameSet("a building", "add it under buildings in facility.yaml")
	for _, b := range fac.Buildings {
		buildings.ids[b.ID] = true
	}
	sites := nameSet("a weather site", "add it under weather_sites in facility.yaml")
	for _, w := range fac.WeatherSites {
		sites.ids[w] = true
	}

	ld.enclosures.keep(func(e *Enclosure) *cellError {
		return ld.enclosures.refs(ref{"BuildingID", e.BuildingID, buildings})
	})
	enclosures := newIndex(ld.enclosures)
	ld.staffRequired()
	staff := newIndex(ld.staff)
	// A protocol's personnel are staff ids; a protocol row naming someone
	// not in staff.csv is rejected before the rows that name the protocol.
	ld.protocols.keep(func(p *Protocol) *cellError {
		rs := make([]ref, len(p.Personnel))
		for i, id := range p.Personnel {
			rs[i] = ref{"Personnel", id, staff}
		}
		return ld.protocols.refs(rs...)
	})
	protocols := newIndex(ld.protocols)
	if !ld.protocols.present {
		// protocols.csv is optional: without it, protocol ids cannot be checked.
		protocols = nil
	}
	protoRef := func(goName, id string) ref {
		if protocols == nil {
			return ref{}
		}
		return ref{goName, id, protocols}
	}

	ld.animals.keep(func(a *Animal) *cellError {
		return ld.animals.refs(ref{"EnclosureID", a.EnclosureID, enclosures}, protoRef("ProtocolID", a.ProtocolID))
	})
	animals := newIndex(ld.animals)

	// Housing: references, then no two stays of one animal overlap. A
	// stay is [moved_in_on, moved_out_on), open-ended when still there.
	// Copies, not pointers: keep compacts l.rows while it runs.
	stays := map[string][]Housing{}
	ld.housing.keep(func(h *Housing) *cellError {
		if ce := ld.housing.refs(ref{"AnimalID", h.AnimalID, animals}, ref{"EnclosureID", h.EnclosureID, enclosures}); ce != nil {
			return ce
		}
		for i := range stays[h.AnimalID] {
			o := &stays[h.AnimalID][i]
			if overlaps(h, o) {
				return ld.housing.cellErr("MovedInOn", h.MovedInOn.String(),
					fmt.Sprintf("stay %s overlaps the stay %s at %s", stay(h), stay(o), o.Ref))
			}
		}
		stays[h.AnimalID] = append(stays[h.AnimalID], *h)
		return nil
	})

	ld.ppe.keep(func(p *PPECheck) *cellError {
		return ld.ppe.refs(ref{"AssignedTo", p.AssignedTo, staff})
	})
	var items *index
	if ld.ppe.present {
		items = nameSet("an item_id in "+ppeFile, "add an inspection of it to "+ppeFile+", or correct the id")
		for _, p := range ld.ppe.rows {
			items.ids[p.ItemID] = true
		}
	}

	keepRounds(ld.care, [4]ref{
		{goName: "EnclosureID", in: enclosures},
		{goName: "BuildingID", in: buildings},
		{goName: "StaffID", in: staff},
		{goName: "ConcernAnimalID", in: animals}})
	ld.handling.keep(func(h *Handling) *cellError {
		// An array, not a slice grown per row: no allocation for each of a year's handlings.
		rs := [4]ref{{"AnimalID", h.AnimalID, animals}, {"StaffID", h.StaffID, staff}, protoRef("ProtocolID", h.ProtocolID)}
		n := 3
		if items != nil {
			rs[3], n = ref{"GloveID", h.GloveID, items}, 4
		}
		return ld.handling.refs(rs[:n]...)
	})
	ld.weather.keep(func(w *Weather) *cellError {
		return ld.weather.refs(ref{"SiteID", w.SiteID, sites})
	})
	ld.work.keep(func(w *OutdoorWork) *cellError {
		return ld.work.refs(ref{"StaffID", w.StaffID, staff}, ref{"SiteID", w.SiteID, sites})
	})
	ld.culls.keep(func(c *Cull) *cellError {
		return ld.culls.refs(ref{"AnimalID", c.AnimalID, animals}, ref{"StaffID", c.StaffID, staff}, protoRef("ProtocolID", c.ProtocolID))
	})
	ld.crossCheckHealth(animals, staff)
	ld.environmentRefs(buildings)
	ld.correctiveRefs(staff)
}

// staffRequired reports a missing staff.csv when any accepted row names a
// person; those rows are then rejected by the reference check.
func (ld *loadedSet) staffRequired() {
	if ld.staff.present {
		return
	}
	n := 0
	for _, p := range ld.ppe.rows {
		if p.AssignedTo != "" {
			n++
		}
	}
	for _, p := range ld.protocols.rows {
		if len(p.Personnel) > 0 {
			n++
		}
	}
	n += ld.care.len() + len(ld.handling.rows) + len(ld.work.rows) + len(ld.culls.rows)
	n += len(ld.deaths.rows) + len(ld.observations.rows) + len(ld.treatments.rows)
	if n > 0 {
		rows := "rows name"
		if n == 1 {
			rows = "row names"
		}
		ld.extra = append(ld.extra, Problem{File: staffFile,
			Reason: fmt.Sprintf("required file is missing: %d %s a staff_id", n, rows)})
	}
}

func overlaps(a, b *Housing) bool {
	// Half-open intervals; a zero MovedOutOn is "still there".
	aEnd, bEnd := a.MovedOutOn, b.MovedOutOn
	return (bEnd == 0 || a.MovedInOn < bEnd) && (aEnd == 0 || b.MovedInOn < aEnd)
}

func stay(h *Housing) string {
	out := "still there"
	if h.MovedOutOn != 0 {
		out = h.MovedOutOn.String()
	}
	return h.MovedInOn.String() + " … " + out
}
