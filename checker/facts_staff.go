package checker

import (
	"slices"
	"sort"

	"welfare/records"
)

// staffDay gathers what one person did on one day. Every fact about a person
// (training, vaccination, fit test, employment) is a property of the day,
// not of the row, so a keeper who handled forty foxes on one day gets one
// finding per check with forty rows of evidence rather than forty findings.
type staffDay struct {
	day     records.Day
	handled []records.Ref
	// Work with a rabies-risk species: handlings, culls, and care rounds of
	// enclosures that species occupies that day. The rounds and the rows
	// outside employment can number hundreds a day: the facts count them
	// and cite only the first maxRefs, so only those are kept.
	rabiesHandled, rabiesCulls []records.Ref
	rabiesRounds               refList
	respirator                 []records.Ref // handlings with a respirator worn
	culls                      []records.Ref
	methods                    []string // cull methods used, first-seen order
	outside                    refList
}

// refList counts rows and keeps the refs of the first maxRefs of them.
type refList struct {
	n     int
	first []records.Ref
}

// count counts one more row and reports whether its ref is to be kept
// (add it with keep): a caller formats a ref only when it is.
func (l *refList) count() bool {
	l.n++
	return len(l.first) < maxRefs
}

func (l *refList) keep(r records.Ref) { l.first = append(l.first, r) }

// merge counts the rows of m after l's, keeping refs up to maxRefs: l is
// then as if m's rows had been added to it one by one. m is l's to keep.
func (l *refList) merge(m *refList) {
	l.n += m.n
	if len(l.first) == 0 {
		l.first = m.first // m is not used after
		return
	}
	for _, r := range m.first {
		if len(l.first) >= maxRefs {
			break
		}
		l.keep(r)
	}
}

func (l *refList) add(r records.Ref) {
	if l.count() {
		l.keep(r)
	}
}

// staffFacts adds each person's "staff" section: per day, the handling
// training, rabies pre-exposure status and respirator fit at the time of
// their handlings; the euthanasia training at the time of their culls; and
// the rows that name them outside their employment window.
func (f *facts) staffFacts() {
	// Each person's days of the period, by index in the period, made on
	// the person's first row: every row counted is of the period, and a
	// year of care rounds looks a person's day up once per round.
	n := int(f.period.To-f.period.From) + 1
	type personDays struct {
		s    *records.Staff
		days []*staffDay // nil until the person's first row
	}
	people := make(map[*records.Staff]*personDays, len(f.set.Staff))
	personOf := func(s *records.Staff) *personDays {
		p := people[s]
		if p == nil {
			p = &personDays{s: s}
			people[s] = p
		}
		return p
	}
	dayOf := func(p *personDays, d records.Day) *staffDay {
		if p.days == nil {
			p.days = make([]*staffDay, n)
		}
		sd := p.days[d-f.period.From]
		if sd == nil {
			sd = &staffDay{day: d}
			p.days[d-f.period.From] = sd
		}
		return sd
	}
	at := func(s *records.Staff, d records.Day) *staffDay { return dayOf(personOf(s), d) }
	// away is whether d is outside s's employment.
	away := func(s *records.Staff, d records.Day) bool {
		return (!s.ActiveFrom.IsZero() && d < s.ActiveFrom) || (!s.ActiveTo.IsZero() && d > s.ActiveTo)
	}
	// outside notes a row naming s on d when d is outside s's employment.
	outside := func(s *records.Staff, d records.Day, ref records.Ref) {
		if away(s, d) {
			at(s, d).outside.add(ref)
		}
	}

	for i := range f.set.Handling {
		h := &f.set.Handling[i]
		d := records.DayOf(h.At)
		s := f.staff[h.StaffID]
		// Rows naming unknown staff were rejected by the loader.
		if s == nil || !f.inPeriod(d) {
			continue
		}
		sd := at(s, d)
		sd.handled = append(sd.handled, h.Ref)
		if a := f.animals[h.AnimalID]; a != nil && f.lim.Species[a.Species].RabiesRisk {
			sd.rabiesHandled = append(sd.rabiesHandled, h.Ref)
		}
		if slices.Contains(h.PPE, "respirator") {
			sd.respirator = append(sd.respirator, h.Ref)
		}
		outside(s, d, h.Ref)
	}
	for i := range f.set.Culls {
		c := &f.set.Culls[i]
		d := records.DayOf(c.At)
		s := f.staff[c.StaffID]
		if s == nil || !f.inPeriod(d) {
			continue
		}
		sd := at(s, d)
		sd.culls = append(sd.culls, c.Ref)
		if a := f.animals[c.AnimalID]; a != nil && f.lim.Species[a.Species].RabiesRisk {
			sd.rabiesCulls = append(sd.rabiesCulls, c.Ref)
		}
		if !slices.Contains(sd.methods, c.Method) {
			sd.methods = append(sd.methods, c.Method)
		}
		outside(s, d, c.Ref)
	}
	// The care rounds, counted in the one pass over them (roundIndex),
	// added where this loop read them: after the culls, before the work.
	sr := f.roundIndex().staff
	for _, p := range sr.people {
		for j := range p.days {
			rc, d := &p.days[j], f.period.From+records.Day(j)
			if rc.outside.n > 0 {
				at(p.s, d).outside.merge(&rc.outside)
			}
			if rc.rabies.n > 0 {
				at(p.s, d).rabiesRounds.merge(&rc.rabies)
			}
		}
	}
	for i := range f.set.Work {
		w := &f.set.Work[i]
		d := records.DayOf(w.StartedAt)
		if s := f.staff[w.StaffID]; s != nil && f.inPeriod(d) {
			outside(s, d, w.Ref)
		}
	}

	for s, p := range people {
		if p.days == nil {
			continue // no row of the period names the person
		}
		handled, culled, out, rabies := []any{}, []any{}, []any{}, []any{}
		for _, sd := range p.days {
			if sd == nil {
				continue
			}
			if r := f.rabiesDay(s, sd); r != nil {
				rabies = append(rabies, r)
			}
			if len(sd.handled) > 0 {
				handled = append(handled, f.handlerDay(s, sd))
			}
			if len(sd.culls) > 0 {
				culled = append(culled, f.operatorDay(s, sd))
			}
			if sd.outside.n > 0 {
				out = append(out, map[string]any{"on": f.dayValue(sd.day), "rows": sd.outside.n, "refs": refs(sd.outside.first...)})
			}
		}
		d := f.doc("staff", s.ID)
		d["staff"] = map[string]any{
			"active_from":    dayOrNull(s.ActiveFrom),
			"active_to":      dayOrNull(s.ActiveTo),
			"handled":        handled,
			"culled":         culled,
			"outside_active": out,
			"rabies":         rabies,
		}
	}
}

// maxRefs is how many rows an entry lists as evidence when its rows can
// number hundreds a day (a keeper's care rounds of enclosures a rabies-risk
// species occupies; the rows naming a person outside their employment): the
// entry counts them all (work, rows), and its refs are the first maxRefs,
// the deciding rows first.
const maxRefs = 10

// firstRefs is the first maxRefs of rs.
func firstRefs(rs []records.Ref) []records.Ref { return rs[:min(len(rs), maxRefs)] }

// trainedAt is a training record as seen on day d: a training dated after
// d did not exist yet. valid_until is the last day the training covers: the
// same date `months` later, so an event on the anniversary itself is still
// covered and the day after is "older than N months".
func trainedAt(on records.Day, months int, d records.Day) map[string]any {
	m := map[string]any{"trained_on": dayOrNull(on), "trained_after_event": !on.IsZero() && on > d, "valid_until": nil}
	if !on.IsZero() && on <= d {
		m["valid_until"] = on.AddMonths(months).String()
	}
	return m
}

// handlerDay is one day of handling by s: training and respirator fit (when
// one was worn).
func (f *facts) handlerDay(s *records.Staff, sd *staffDay) map[string]any {
	d := sd.day
	out := map[string]any{
		"on":         f.dayValue(d),
		"refs":       refs(sd.handled...),
		"training":   trainedAt(s.HandlingTrainedOn, f.lim.Staff.HandlingTrainingMonths, d),
		"respirator": nil,
	}
	if len(sd.respirator) > 0 {
		r := trainedAt(s.RespiratorFitOn, f.lim.Staff.RespiratorFitMonths, d)
		out["respirator"] = map[string]any{
			"refs": refs(sd.respirator...), "fit_on": r["trained_on"],
			"fit_after_event": r["trained_after_event"], "valid_until": r["valid_until"],
		}
	}
	return out
}

// operatorDay is one day of culls by s: the methods used that s is not
// recorded as trained for, and the euthanasia training's age.
func (f *facts) operatorDay(s *records.Staff, sd *staffDay) map[string]any {
	untrained := []any{}
	for _, m := range sd.methods {
		if !slices.Contains(s.EuthanasiaMethods, m) {
			untrained = append(untrained, m)
		}
	}
	out := trainedAt(s.EuthanasiaTrainedOn, f.lim.Staff.EuthanasiaTrainingMonths, sd.day)
	out["on"] = f.dayValue(sd.day)
	out["refs"] = refs(sd.culls...)
	out["methods"] = strs(sd.methods)
	out["untrained_methods"] = untrained
	return out
}

// rabiesRecord is a person's rabies pre-exposure record as known on day d:
// the day the 2-dose series was completed, and the latest titer (with its
// value) and booster dated on or before d (null when none; a titer or
// booster dated after d is not yet known at d). The rules judge it by the
// ACIP 2022 schedule (MMWR 2022;71(18):619–627) of the person's risk
// category.
func rabiesRecord(s *records.Staff, d records.Day, work []records.Ref) map[string]any {
	r := map[string]any{
		"refs": refs(work...), "primary_on": dayOrNull(s.RabiesPrimaryOn),
		"titer_on": nil, "titer_iu_ml": nil, "booster_on": nil,
	}
	if s.RabiesTiterIUmL != nil && !s.RabiesTiterOn.IsZero() && s.RabiesTiterOn <= d {
		r["titer_on"], r["titer_iu_ml"] = s.RabiesTiterOn.String(), *s.RabiesTiterIUmL
	}
	if !s.RabiesBoosterOn.IsZero() && s.RabiesBoosterOn <= d {
		r["booster_on"] = s.RabiesBoosterOn.String()
	}
	return r
}

// staffRounds counts, per person and day of the period, the care rounds
// the person did outside their employment and those of an enclosure a
// rabies-risk species occupied that day, keeping the refs of the first
// maxRefs of each. It is filled in the one pass over the rounds
// (roundIndex, visit) and read by staffFacts.
type staffRounds struct {
	f       *facts
	staffOf []*staffRoundDays // per key of the rounds' table; nil: no such person
	people  []*staffRoundDays
	risky   *riskyRounds
}

type staffRoundDays struct {
	s    *records.Staff
	days []staffRoundCounts // by index in the period; nil until needed
}

type staffRoundCounts struct{ outside, rabies refList }

func (f *facts) newStaffRounds() *staffRounds {
	strs := f.rounds.Strings()
	sr := &staffRounds{f: f, staffOf: make([]*staffRoundDays, len(strs)), risky: f.rabiesRiskRounds()}
	byStaff := map[*records.Staff]*staffRoundDays{}
	for k, id := range strs {
		s := f.staff[id]
		if s == nil {
			continue
		}
		p := byStaff[s]
		if p == nil {
			p = &staffRoundDays{s: s}
			byStaff[s] = p
			sr.people = append(sr.people, p)
		}
		sr.staffOf[k] = p
	}
	return sr
}

// visit counts round i of day d (a day of the period).
func (sr *staffRounds) visit(i int, k records.CareKeys, d records.Day) {
	p := sr.staffOf[k.Staff]
	if p == nil {
		return
	}
	s, f := p.s, sr.f
	away := (!s.ActiveFrom.IsZero() && d < s.ActiveFrom) || (!s.ActiveTo.IsZero() && d > s.ActiveTo)
	risky := sr.risky.on(k, d)
	if !away && !risky {
		return
	}
	if p.days == nil {
		p.days = make([]staffRoundCounts, int(f.period.To-f.period.From)+1)
	}
	rc := &p.days[d-f.period.From]
	// The ref is formatted only for a round the facts cite.
	if away && rc.outside.count() {
		rc.outside.keep(f.rounds.Ref(i))
	}
	if risky && rc.rabies.count() {
		rc.rabies.keep(f.rounds.Ref(i))
	}
}

// rabiesRiskRounds tells whether a care round covers an enclosure occupied
// that day by a rabies-risk species (a building round covers every
// enclosure of its building). A building round's result is kept per
// building and day, since a year of them names the same few hundred of
// each; an enclosure's round of the period tests a bit of the enclosure's
// risky days, worked out once from its occupancy segments.
func (f *facts) rabiesRiskRounds() *riskyRounds {
	byBuilding := map[string][]string{}
	for i := range f.set.Enclosures {
		e := &f.set.Enclosures[i]
		byBuilding[e.BuildingID] = append(byBuilding[e.BuildingID], e.ID)
	}
	// Whether each occupancy segment holds a rabies-risk species, worked
	// out once per segment rather than once per round.
	type occ struct {
		segs  []segment
		risky []bool
	}
	byEnc := make(map[string]occ, len(f.segments))
	for id, segs := range f.segments {
		risky := make([]bool, len(segs))
		for i := range segs {
			risky[i] = slices.ContainsFunc(segs[i].Occupants, func(o occupant) bool {
				return f.lim.Species[o.Animal.Species].RabiesRisk
			})
		}
		byEnc[id] = occ{segs, risky}
	}
	riskyOn := func(o occ, d records.Day) bool {
		i := sort.Search(len(o.segs), func(i int) bool { return o.segs[i].To >= d })
		return i < len(o.segs) && o.segs[i].From <= d && o.risky[i]
	}
	// The rounds' enclosures, resolved once per key of the rounds' table;
	// an enclosure's risky days of the period as bits, in blocks shared by
	// 64 enclosures (a round of the period tests a bit instead of
	// searching the enclosure's segments).
	strs := f.rounds.Strings()
	encOf := make([]occ, len(strs))
	words := (int(f.period.To-f.period.From) + 1 + 63) / 64
	bitsOf := make([][]uint64, len(strs)) // nil: no risky day
	var bits []uint64
	for k, id := range strs {
		o := byEnc[id]
		encOf[k] = o
		if !slices.Contains(o.risky, true) {
			continue
		}
		if len(bits) < words {
			bits = make([]uint64, 64*words)
		}
		kb := bits[:words:words]
		bits = bits[words:]
		bitsOf[k] = kb
		for i, seg := range o.segs {
			if !o.risky[i] {
				continue
			}
			for d := max(seg.From, f.period.From); d <= seg.To && d <= f.period.To; d++ {
				j := int(d - f.period.From)
				kb[j/64] |= 1 << (j % 64)
			}
		}
	}
	type key struct {
		building uint32
		day      records.Day
	}
	memo := map[key]bool{}
	return &riskyRounds{from: f.period.From, to: f.period.To, bits: bitsOf, other: func(k records.CareKeys, d records.Day) bool {
		if k.Enclosure != 0 {
			return riskyOn(encOf[k.Enclosure], d)
		}
		mk := key{k.Building, d}
		if v, ok := memo[mk]; ok {
			return v
		}
		v := slices.ContainsFunc(byBuilding[strs[k.Building]], func(e string) bool { return riskyOn(byEnc[e], d) })
		memo[mk] = v
		return v
	}}
}

// riskyRounds tells whether a care round is rabies-risk work
// (rabiesRiskRounds): an enclosure's round of the period by its bits, any
// other by other.
type riskyRounds struct {
	from, to records.Day
	bits     [][]uint64 // per key of the rounds' table: the period's risky days; nil: none
	other    func(k records.CareKeys, d records.Day) bool
}

func (r *riskyRounds) on(k records.CareKeys, d records.Day) bool {
	if k.Enclosure == 0 || d < r.from || d > r.to {
		return r.other(k, d)
	}
	kb, j := r.bits[k.Enclosure], int(d-r.from)
	return kb != nil && kb[j/64]&(1<<(j%64)) != 0
}

// rabiesDay is one day on which s worked with a rabies-risk species —
// handled one, culled one, or did a care round of an enclosure one
// occupied — with s's pre-exposure record that day and s's own ACIP 2022
// risk category (the limits' category when staff.csv gives none), for the
// rules to judge; nil on a day without such work. work counts every row of
// that work; refs are the first maxRefs of them (handlings, culls, then
// care rounds).
func (f *facts) rabiesDay(s *records.Staff, sd *staffDay) map[string]any {
	n := len(sd.rabiesHandled) + len(sd.rabiesCulls) + sd.rabiesRounds.n
	if n == 0 {
		return nil
	}
	category := f.lim.Staff.Rabies.RiskCategory
	if s.RabiesRiskCategory != nil {
		category = *s.RabiesRiskCategory
	}
	work := slices.Concat(firstRefs(sd.rabiesHandled), firstRefs(sd.rabiesCulls), sd.rabiesRounds.first)
	r := rabiesRecord(s, sd.day, firstRefs(work))
	r["on"] = f.dayValue(sd.day)
	r["category"] = category
	r["work"] = map[string]any{
		"handlings":   len(sd.rabiesHandled),
		"culls":       len(sd.rabiesCulls),
		"care_rounds": sd.rabiesRounds.n,
	}
	return r
}
