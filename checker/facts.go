package checker

import (
	"sort"
	"strconv"

	"github.com/open-policy-agent/opa/v1/ast"

	"welfare/records"
	"welfare/rules"
)

// facts holds the indexes that every domain's facts are computed from, and
// the input documents being built, one per subject. Domain files
// (facts_care.go, facts_enclosure.go, ...) each add their own section to the
// documents of the subjects they describe.
type facts struct {
	set *records.Set
	lim *rules.Limits
	// rounds are the set's care rounds (built once for a set made by hand).
	rounds *records.CareRounds
	period Period

	animals    map[string]*records.Animal
	enclosures map[string]*records.Enclosure
	buildings  map[string]records.Building
	staff      map[string]*records.Staff
	protocols  map[string]*records.Protocol
	// byBuilding lists each building's enclosure ids in file order.
	byBuilding map[string][]string
	// stays lists, per enclosure, the animals' stays clipped to the period;
	// homes lists the same stays per animal, for "where was it that day".
	stays map[string][]stay
	homes map[string][]stay
	// segments is each enclosure's occupancy over the period as runs of days
	// with the same occupants and life stages (see occupancy.go).
	segments map[string][]segment

	// Built on first use by the domains that need them.
	care *careDays
	// rix is what the round-reading builders take from the care rounds,
	// read once (facts_rounds.go); released with the rounds.
	rix      *roundIndex
	handling map[string][]*records.Handling
	// residences: every animal's stays over all time (facts_health.go).
	residences []residence

	// deathDay is each animal's death (deaths.csv): its last day, as left_on is.
	deathDay map[string]records.Day

	// days are the period's days as document values, shared by every
	// entry that names one (dayValue).
	days *dayValues

	docs map[string]map[string]map[string]any // kind -> subject id -> document
	// forked: a fork's (domains.go), whose documents are made small (doc).
	forked bool

	// For the report: care coverage and the weather sites' daily minima.
	coverage CareCoverage
	weather  []SiteDays
}

// stay is one animal in one enclosure from From to To inclusive (To is
// clipped to the period end when the stay is open).
type stay struct {
	Animal    *records.Animal
	Enclosure string
	From, To  records.Day
	Ref       records.Ref
}

func newFacts(set *records.Set, lim *rules.Limits, p Period) *facts {
	f := &facts{
		set: set, lim: lim, period: p, rounds: set.CareRounds(),
		animals:    make(map[string]*records.Animal, len(set.Animals)),
		enclosures: make(map[string]*records.Enclosure, len(set.Enclosures)),
		buildings:  make(map[string]records.Building, len(set.Facility.Buildings)),
		staff:      make(map[string]*records.Staff, len(set.Staff)),
		protocols:  make(map[string]*records.Protocol, len(set.Protocols)),
		byBuilding: map[string][]string{},
		docs:       map[string]map[string]map[string]any{},
		days:       newDayValues(p),
	}
	for i := range set.Animals {
		f.animals[set.Animals[i].ID] = &set.Animals[i]
	}
	for i := range set.Enclosures {
		e := &set.Enclosures[i]
		f.enclosures[e.ID] = e
		f.byBuilding[e.BuildingID] = append(f.byBuilding[e.BuildingID], e.ID)
	}
	for _, b := range set.Facility.Buildings {
		f.buildings[b.ID] = b
	}
	for i := range set.Staff {
		f.staff[set.Staff[i].ID] = &set.Staff[i]
	}
	for i := range set.Protocols {
		f.protocols[set.Protocols[i].ID] = &set.Protocols[i]
	}
	f.deathDay = make(map[string]records.Day, len(set.Deaths))
	for i := range set.Deaths {
		f.deathDay[set.Deaths[i].AnimalID] = records.DayOf(set.Deaths[i].FoundDeadAt)
	}
	f.stays = f.buildStays()
	f.homes = map[string][]stay{}
	for _, ss := range f.stays {
		for _, s := range ss {
			f.homes[s.Animal.ID] = append(f.homes[s.Animal.ID], s)
		}
	}
	f.segments = make(map[string][]segment, len(f.stays))
	for id, ss := range f.stays {
		f.segments[id] = f.occupancy(f.enclosures[id], ss)
	}
	return f
}

// buildStays places each animal in its enclosures: from housing.csv when the
// file exists (it replaces animals.enclosure_id), else the home enclosure
// from arrival to departure.
func (f *facts) buildStays() map[string][]stay {
	out := map[string][]stay{}
	add := func(encID string, s stay) {
		// A stay ends at the animal's departure even if housing says otherwise.
		if a := s.Animal; !a.LeftOn.IsZero() && (s.To.IsZero() || s.To > a.LeftOn) {
			s.To = a.LeftOn
		}
		// A death ends the stay too, even when animals.csv was not updated.
		if dd, ok := f.deathDay[s.Animal.ID]; ok && (s.To.IsZero() || s.To > dd) {
			s.To = dd
		}
		if s.To.IsZero() || s.To > f.period.To {
			s.To = f.period.To
		}
		if s.From < f.period.From {
			s.From = f.period.From
		}
		if s.From > s.To {
			return
		}
		s.Enclosure = encID
		out[encID] = append(out[encID], s)
	}
	if f.set.Present["housing.csv"] {
		for i := range f.set.Housing {
			h := &f.set.Housing[i]
			a, ok := f.animals[h.AnimalID]
			if !ok {
				continue
			}
			to := h.MovedOutOn
			if !to.IsZero() {
				// The move-out day counts in the new enclosure.
				to--
			}
			from := h.MovedInOn
			if from < a.ArrivedOn {
				from = a.ArrivedOn
			}
			add(h.EnclosureID, stay{Animal: a, From: from, To: to, Ref: h.Ref})
		}
	} else {
		for i := range f.set.Animals {
			a := &f.set.Animals[i]
			if a.EnclosureID == "" {
				continue
			}
			add(a.EnclosureID, stay{Animal: a, From: a.ArrivedOn, To: a.LeftOn, Ref: a.Ref})
		}
	}
	for id := range out {
		ss := out[id]
		sort.SliceStable(ss, func(i, j int) bool { return ss[i].From < ss[j].From })
	}
	return out
}

// doc returns the input document of one subject, creating it on first use
// with what every document has in the same place: kind, id, name (the
// person's name, the protocol's title, the facility's name; null for
// subjects without one) and ref (the FILE:LINE of the subject's own row;
// null for subjects without one).
func (f *facts) doc(kind, id string) map[string]any {
	byID := f.docs[kind]
	if byID == nil {
		byID = map[string]map[string]any{}
		f.docs[kind] = byID
	}
	d := byID[id]
	if d == nil {
		var name, ref any
		switch kind {
		case "facility":
			name = f.set.Facility.Name
		case "animal":
			if a := f.animals[id]; a != nil {
				ref = string(a.Ref)
			}
		case "enclosure":
			if e := f.enclosures[id]; e != nil {
				ref = string(e.Ref)
			}
		case "staff":
			if s := f.staff[id]; s != nil {
				name, ref = s.Name, string(s.Ref)
			}
		case "protocol":
			if p := f.protocols[id]; p != nil {
				name, ref = p.Title, string(p.Ref)
			}
		}
		size := docKeys[kind]
		if f.forked {
			// Most of a fork's documents add a section or two to one f
			// has (join) and are let go then.
			size = 0
		}
		d = make(map[string]any, size)
		d["kind"], d["id"], d["name"], d["ref"] = kind, id, name, ref
		byID[id] = d
	}
	return d
}

// docKeys is about how many keys a document of each kind ends with (the
// common four and the domains' sections), so a document is made at its
// size instead of growing twice as the builders add their sections. Only
// the map's first size: a document with more keys grows as any map does.
var docKeys = map[string]int{"animal": 22, "enclosure": 18, "building": 6, "facility": 7, "protocol": 5, "staff": 6, "site": 6, "item": 5}

// inputs returns the documents of one kind sorted by subject id, so
// evaluation order (and so any error) is deterministic.
func (f *facts) inputs(kind string) []map[string]any {
	byID := f.docs[kind]
	ids := make([]string, 0, len(byID))
	for id := range byID {
		ids = append(ids, id)
	}
	sort.Strings(ids)
	out := make([]map[string]any, len(ids))
	for i, id := range ids {
		out[i] = byID[id]
	}
	return out
}

// inPeriod reports whether a day falls in the checked period.
func (f *facts) inPeriod(d records.Day) bool { return d >= f.period.From && d <= f.period.To }

// lifeStage is the animal's stage on day d: the recorded life_stage wins;
// otherwise juvenile while younger than the limits' juvenile age.
func (f *facts) lifeStage(a *records.Animal, d records.Day) string {
	if a.LifeStage != "" {
		return a.LifeStage
	}
	if !a.BornOn.IsZero() && d < a.BornOn.AddMonths(f.lim.Juveniles.UnderMonths) {
		return "juvenile"
	}
	return "adult"
}

// refs turns refs into the []any of strings a document holds.
func refs(rs ...records.Ref) []any {
	out := make([]any, 0, len(rs))
	for _, r := range rs {
		if r != "" {
			out = append(out, string(r))
		}
	}
	return out
}

// strs turns a string slice into the []any a document holds.
func strs(ss []string) []any {
	out := make([]any, len(ss))
	for i, s := range ss {
		out[i] = s
	}
	return out
}

// num gives an optional number as a document value: null when not recorded.
func num(p *float64) any {
	if p == nil {
		return nil
	}
	return *p
}

// dayOrNull gives a day as "YYYY-MM-DD", or null when not recorded.
func dayOrNull(d records.Day) any {
	if d.IsZero() {
		return nil
	}
	return d.String()
}

func itoa(n int) string { return strconv.Itoa(n) }

// dayRun collects consecutive days; step returns the finished run (from, to)
// when day d breaks it.
type dayRun struct{ from, to records.Day }

func (r *dayRun) step(d records.Day, bad bool) (from, to records.Day, done bool) {
	if r.from != 0 && (!bad || d != r.to+1) {
		from, to, done = r.from, r.to, true
		*r = dayRun{}
	}
	if bad {
		if r.from == 0 {
			r.from = d
		}
		r.to = d
	}
	return from, to, done
}

func (r *dayRun) flush() (from, to records.Day, done bool) {
	if r.from == 0 {
		return 0, 0, false
	}
	from, to = r.from, r.to
	*r = dayRun{}
	return from, to, true
}

// spanRun is a plain run of days as a document value.
func spanRun(from, to records.Day) map[string]any {
	return map[string]any{"from": from.String(), "until": to.String(), "days": int(to-from) + 1}
}

// dayValue is day d as a document value ("YYYY-MM-DD"): for a day of the
// period, the one value every entry naming it shares.
func (f *facts) dayValue(d records.Day) any { return f.days.of(d) }

// exactCopy copies a builder's scratch buffer out at its exact size, nil
// when it is empty (as a slice never appended to is), so the buffer can be
// reused for the next subject.
func exactCopy[T any](s []T) []T {
	if len(s) == 0 {
		return nil
	}
	return append(make([]T, 0, len(s)), s...)
}

// dayValues gives days as document values ("YYYY-MM-DD" as an any), made
// once per day of the period and shared by every document entry that names
// the day; a day outside the period gets a value of its own.
type dayValues struct {
	from records.Day
	vals []any
	// terms are the same days as OPA values, made on first use (term).
	terms []*ast.Term
}

func newDayValues(p Period) *dayValues {
	v := &dayValues{from: p.From, vals: make([]any, max(int(p.To-p.From)+1, 0))}
	for i := range v.vals {
		v.vals[i] = (p.From + records.Day(i)).String()
	}
	return v
}

func (v *dayValues) of(d records.Day) any {
	if i := int(d - v.from); i >= 0 && i < len(v.vals) {
		return v.vals[i]
	}
	return d.String()
}

// makeTerms makes the period's days as OPA values, for term. Fact builders
// call it while building (one at a time), never the evaluation's workers.
func (v *dayValues) makeTerms() {
	if v.terms != nil {
		return
	}
	v.terms = make([]*ast.Term, len(v.vals))
	for i, s := range v.vals {
		v.terms[i] = ast.StringTerm(s.(string))
	}
}

// term is a day's text as an OPA value: one of the terms made once when
// makeTerms was called, else a new one.
func (v *dayValues) term(c *converter, d records.Day) *ast.Term {
	if i := int(d - v.from); i >= 0 && i < len(v.terms) {
		return v.terms[i]
	}
	return c.str(d.String())
}
