package checker

import (
	"slices"
	"sort"
	"time"

	"github.com/open-policy-agent/opa/v1/ast"

	"welfare/records"
)

// healthFacts adds the health sections. Go measures (hours, days, masses,
// counts, population-days); the rules in health.rego compare them with the
// limits, so a committee that edits a limit or a rule changes the outcome.
//
// Per animal: "deaths", "weights", "conditions", "signs", "cases" and
// "deaths_recorded", "left_in_period"; on the facility document: "mortality" per building and
// calendar month. Day numbers ("day", "from_day", ...) count days since
// 1970-01-01, so rules can subtract them.
func (f *facts) healthFacts() {
	f.deathFacts()
	f.observationFacts()
	f.caseFacts()
	f.mortalityFacts()
}

// healthDoc returns an animal's document with the health sections present.
func (f *facts) healthDoc(a *records.Animal) map[string]any {
	d := f.animalDoc(a)
	if _, ok := d["deaths_recorded"]; !ok {
		d["deaths_recorded"] = f.set.Present["deaths.csv"]
		d["left_in_period"] = !a.LeftOn.IsZero() && f.inPeriod(a.LeftOn)
		for _, k := range []string{"deaths", "weights", "conditions", "signs", "cases"} {
			d[k] = []any{}
		}
	}
	return d
}

func appendHealth(d map[string]any, key string, v any) {
	list, _ := d[key].([]any)
	d[key] = append(list, v)
}

func minuteStamp(t time.Time) string { return t.Format("2006-01-02 15:04") }

// deathFacts: each death row of the animal (an animal dies once), with the
// delay to the veterinarian's notification; and every animal recorded as
// died in the period, so a missing death row can be noticed.
func (f *facts) deathFacts() {
	for i := range f.set.Deaths {
		dr := &f.set.Deaths[i]
		a := f.animals[dr.AnimalID]
		if a == nil {
			continue
		}
		day := records.DayOf(dr.FoundDeadAt)
		var notified, hours any
		if !dr.VetNotifiedAt.IsZero() {
			notified = minuteStamp(dr.VetNotifiedAt)
			hours = dr.VetNotifiedAt.Sub(dr.FoundDeadAt).Hours()
		}
		appendHealth(f.healthDoc(a), "deaths", map[string]any{
			"on":              day.String(),
			"at":              minuteStamp(dr.FoundDeadAt),
			"ref":             string(dr.Ref),
			"in_period":       f.inPeriod(day),
			"found_by":        dr.FoundBy,
			"cause":           nilIfEmpty(dr.SuspectedCause),
			"vet_notified_at": notified,
			"notify_hours":    hours,
			"necropsy":        dr.Necropsy.IsYes(),
			"necropsy_ref":    nilIfEmpty(dr.NecropsyRef),
		})
	}
	for i := range f.set.Animals {
		a := &f.set.Animals[i]
		if a.LeftReason == "died" && f.inPeriod(a.LeftOn) {
			f.healthDoc(a)
		}
	}
}

// observationFacts: the animal's weighings up to the period's end (a
// weighing in the period is compared with those before it), its body
// condition scores in the period, and its observations with signs up to the
// period's end, each with the first handling of every purpose at or after
// the observation and the first case opened on or after its day.
func (f *facts) observationFacts() {
	// Each animal's handlings, cut from one block at their exact size.
	handled := map[string]int{}
	for i := range f.set.Handling {
		handled[f.set.Handling[i].AnimalID]++
	}
	handlings := make(map[string][]*records.Handling, len(handled))
	hblock := make([]*records.Handling, 0, len(f.set.Handling))
	for i := range f.set.Handling {
		h := &f.set.Handling[i]
		hs, ok := handlings[h.AnimalID]
		if !ok {
			n := handled[h.AnimalID]
			hs = hblock[len(hblock) : len(hblock) : len(hblock)+n]
			hblock = hblock[:len(hblock)+n]
		}
		handlings[h.AnimalID] = append(hs, h)
	}
	for _, hs := range handlings {
		sort.SliceStable(hs, func(i, j int) bool { return hs[i].At.Before(hs[j].At) })
	}
	cases := map[string][]*records.Treatment{}
	for i := range f.set.Treatments {
		t := &f.set.Treatments[i]
		cases[t.AnimalID] = append(cases[t.AnimalID], t)
	}
	obs := make([]*records.Observation, 0, len(f.set.Observations))
	for i := range f.set.Observations {
		o := &f.set.Observations[i]
		if f.animals[o.AnimalID] != nil && records.DayOf(o.At) <= f.period.To {
			obs = append(obs, o)
		}
	}
	sort.SliceStable(obs, func(i, j int) bool { return obs[i].At.Before(obs[j].At) })
	// The weights and conditions sections are lazy (lazy.go): the facts
	// keep each weighing and score compactly (obsTable) and the entries are
	// made when the animal is evaluated; the report's weight charts make
	// them again after (result_health.go).
	ot := &obsTable{days: f.days, refs: newRowRefs()}
	// The weighings and scores kept are counted per animal first, so each
	// animal's are cut from one block at their exact size.
	nWeights, nConds := map[*records.Animal]int{}, map[*records.Animal]int{}
	totalW, totalC := 0, 0
	for _, o := range obs {
		a := f.animals[o.AnimalID]
		if o.MassKg != nil {
			nWeights[a]++
			totalW++
		}
		if o.BodyCondition != nil && f.inPeriod(records.DayOf(o.At)) {
			nConds[a]++
			totalC++
		}
	}
	wblock, cblock := make([]weighing, 0, totalW), make([]condition, 0, totalC)
	weights := make(map[*records.Animal]*animalWeights, len(nWeights))
	conds := make(map[*records.Animal]*animalConditions, len(nConds))
	for _, o := range obs {
		a := f.animals[o.AnimalID]
		day := records.DayOf(o.At)
		in := f.inPeriod(day)
		if o.MassKg != nil {
			aw := weights[a]
			if aw == nil {
				n := nWeights[a]
				aw = &animalWeights{t: ot, rows: wblock[len(wblock) : len(wblock) : len(wblock)+n]}
				wblock = wblock[:len(wblock)+n]
				weights[a] = aw
				f.healthDoc(a)["weights"] = &lazy{make: aw.section, term: aw.sectionTerm}
			}
			aw.rows = append(aw.rows, weighing{day: day, minute: minuteOfDay(o.At), in: in, kg: *o.MassKg, ref: ot.refs.code(o.Ref)})
		}
		if o.BodyCondition != nil && in {
			ac := conds[a]
			if ac == nil {
				n := nConds[a]
				ac = &animalConditions{t: ot, rows: cblock[len(cblock) : len(cblock) : len(cblock)+n]}
				cblock = cblock[:len(cblock)+n]
				conds[a] = ac
				f.healthDoc(a)["conditions"] = &lazy{make: ac.section, term: ac.sectionTerm}
			}
			ac.rows = append(ac.rows, condition{day: day, score: int32(*o.BodyCondition), ref: ot.refs.code(o.Ref)})
		}
		if len(o.Signs) == 0 {
			continue
		}
		answers := []any{}
		seen := map[string]bool{}
		for _, h := range handlings[a.ID] {
			if h.At.Before(o.At) || seen[h.Purpose] {
				continue
			}
			seen[h.Purpose] = true
			answers = append(answers, map[string]any{
				"purpose": h.Purpose, "hours": h.At.Sub(o.At).Hours(), "ref": string(h.Ref),
			})
		}
		var firstCase any
		var best *records.Treatment
		for _, t := range cases[a.ID] {
			if t.OpenedOn >= day && (best == nil || t.OpenedOn < best.OpenedOn) {
				best = t
			}
		}
		if best != nil {
			firstCase = map[string]any{"id": best.CaseID, "days": int(best.OpenedOn - day), "ref": string(best.Ref)}
		}
		appendHealth(f.healthDoc(a), "signs", map[string]any{
			"on": day.String(), "day": int(day), "at": minuteStamp(o.At), "ref": string(o.Ref), "in_period": in,
			"signs": strs(o.Signs), "vet_informed": o.VetInformed.IsYes(),
			"answers": answers, "case": firstCase,
		})
	}
	for _, aw := range weights {
		aw.rows = slices.Clip(aw.rows)
	}
	for _, ac := range conds {
		ac.rows = slices.Clip(ac.rows)
	}
	ot.finish()
}

// obsTable is what the weights and conditions sections of every animal
// share: the period's days (as document and OPA values) and the rows' refs.
type obsTable struct {
	days *dayValues
	refs *rowRefs
	// from is the period's first day, dayNums the period's day numbers as
	// OPA values (dayNumber).
	from    records.Day
	dayNums []*ast.Term
}

func (t *obsTable) finish() {
	t.days.makeTerms()
	t.from = t.days.from
	t.dayNums = make([]*ast.Term, len(t.days.vals))
	for i := range t.dayNums {
		t.dayNums[i] = ast.InternedTerm(int(t.from) + i)
	}
}

// weighing is one weighing as the facts keep it: its day and minute, the
// mass, the row and whether it is in the period. Its place in the animal's
// series (n) is its index.
type weighing struct {
	day    records.Day
	minute uint16
	in     bool
	kg     float64
	ref    rowRef
}

// animalWeights is an animal's weighings up to the period's end, in time
// order.
type animalWeights struct {
	t    *obsTable
	rows []weighing
}

func (aw *animalWeights) section() any {
	out := make([]any, len(aw.rows))
	for i, w := range aw.rows {
		out[i] = map[string]any{
			"n": i, "on": aw.t.days.of(w.day), "day": int(w.day), "at": minuteStampOf(stampDay(w.day), w.minute),
			"kg": w.kg, "ref": aw.t.refs.ref(w.ref), "in_period": w.in,
		}
	}
	return out
}

// Keys of a weighing and a condition score.
var (
	keyN        = ast.InternedTerm("n")
	keyDay      = ast.InternedTerm("day")
	keyKg       = ast.InternedTerm("kg")
	keyInPeriod = ast.InternedTerm("in_period")
	keyScore    = ast.InternedTerm("score")
)

// sectionTerm makes the weights section as the OPA value converting
// section's gives. The terms and texts each entry makes afresh come from
// blocks made once for the section (entryBlocks).
func (aw *animalWeights) sectionTerm(c *converter) (*ast.Term, error) {
	t := aw.t
	b := newEntryBlocks(len(aw.rows), 3, 2, func(buf []byte, i, k int) []byte {
		w := &aw.rows[i]
		if k == 0 {
			return appendStamp(buf, stampDayOf(t.days, w.day), w.minute)
		}
		return appendRef(buf, t.refs, w.ref)
	})
	elems := make([]*ast.Term, len(aw.rows))
	var pairs [7][2]*ast.Term
	for i := range aw.rows {
		w := &aw.rows[i]
		pairs = [7][2]*ast.Term{
			{keyN, ast.InternedTerm(i)},
			{keyOn, t.days.term(c, w.day)},
			{keyDay, t.dayNumber(w.day)},
			{keyAt, b.text(i, 0)},
			{keyKg, c.num(w.kg)},
			{keyRef, b.text(i, 1)},
			{keyInPeriod, ast.InternedTerm(w.in)},
		}
		elems[i] = b.term(ast.NewObject(pairs[:]...))
	}
	return ast.NewTerm(ast.NewArray(elems...)), nil
}

// dayNumber is a day's number as an OPA value: the period's made once in
// finish and shared, any other day's made afresh.
func (t *obsTable) dayNumber(d records.Day) *ast.Term {
	if i := int(d - t.from); i >= 0 && i < len(t.dayNums) {
		return t.dayNums[i]
	}
	return ast.InternedTerm(int(d))
}

// condition is one body condition score in the period.
type condition struct {
	day   records.Day
	score int32
	ref   rowRef
}

// animalConditions is an animal's condition scores in the period, in time
// order.
type animalConditions struct {
	t    *obsTable
	rows []condition
}

func (ac *animalConditions) section() any {
	out := make([]any, len(ac.rows))
	for i, r := range ac.rows {
		out[i] = map[string]any{"on": ac.t.days.of(r.day), "score": int(r.score), "ref": ac.t.refs.ref(r.ref)}
	}
	return out
}

func (ac *animalConditions) sectionTerm(c *converter) (*ast.Term, error) {
	t := ac.t
	elems := make([]*ast.Term, len(ac.rows))
	b := newEntryBlocks(len(ac.rows), 2, 1, func(buf []byte, i, _ int) []byte {
		return appendRef(buf, t.refs, ac.rows[i].ref)
	})
	var pairs [3][2]*ast.Term
	for i := range ac.rows {
		r := &ac.rows[i]
		pairs = [3][2]*ast.Term{
			{keyOn, t.days.term(c, r.day)},
			{keyScore, ast.InternedTerm(int(r.score))},
			{keyRef, b.text(i, 0)},
		}
		elems[i] = b.term(ast.NewObject(pairs[:]...))
	}
	return ast.NewTerm(ast.NewArray(elems...)), nil
}

// caseFacts: each veterinary case open at some time in the period, with its
// reviews (its opening, its reviewed_on, and vet_exam handlings of the animal
// while it was open) as intervals: from one review to the next, or to the
// day the case closed, or to the day after the period.
func (f *facts) caseFacts() {
	exams := map[string][]*records.Handling{}
	for i := range f.set.Handling {
		h := &f.set.Handling[i]
		if h.Purpose == "vet_exam" {
			exams[h.AnimalID] = append(exams[h.AnimalID], h)
		}
	}
	for i := range f.set.Treatments {
		t := &f.set.Treatments[i]
		a := f.animals[t.AnimalID]
		if a == nil || t.OpenedOn > f.period.To || (!t.ClosedOn.IsZero() && t.ClosedOn < f.period.From) {
			continue
		}
		stop := f.period.To + 1
		if !t.ClosedOn.IsZero() && t.ClosedOn < stop {
			stop = t.ClosedOn
		}
		type review struct {
			day records.Day
			ref records.Ref
			by  string
		}
		reviews := []review{{t.OpenedOn, t.Ref, "opened"}}
		if !t.ReviewedOn.IsZero() {
			reviews = append(reviews, review{t.ReviewedOn, t.Ref, "reviewed_on"})
		}
		for _, h := range exams[a.ID] {
			if d := records.DayOf(h.At); d >= t.OpenedOn && d < stop {
				reviews = append(reviews, review{d, h.Ref, "vet_exam"})
			}
		}
		sort.SliceStable(reviews, func(i, j int) bool { return reviews[i].day < reviews[j].day })
		intervals := []any{}
		for i, r := range reviews {
			if i+1 < len(reviews) && reviews[i+1].day == r.day {
				continue // the later review of the same day stands
			}
			next, nextBy := stop, "period end"
			if !t.ClosedOn.IsZero() && stop == t.ClosedOn {
				nextBy = "closed"
			}
			for _, n := range reviews[i+1:] {
				if n.day > r.day {
					next, nextBy = n.day, n.by
					break
				}
			}
			if next > stop {
				next = stop
			}
			intervals = append(intervals, map[string]any{
				"from": r.day.String(), "from_day": int(r.day), "by": r.by, "ref": string(r.ref),
				"next_day": int(next), "next": nextBy,
			})
		}
		appendHealth(f.healthDoc(a), "cases", map[string]any{
			"id": t.CaseID, "ref": string(t.Ref), "opened_on": t.OpenedOn.String(),
			"closed_on": dayOrNull(t.ClosedOn), "outcome": nilIfEmpty(t.Outcome), "diagnosis": t.Diagnosis,
			"period_from_day": int(f.period.From), "period_until_day": int(f.period.To),
			"intervals": intervals,
		})
	}
}

// mortalityFacts adds to the facility document, per building and calendar
// month overlapping the period with at least one death (deaths.csv, not
// culls), the deaths and the building's animal-days that month: every day
// of the month counts, the day an animal leaves (or dies) as present; kits
// in litters.csv are not animals.csv rows and are not counted. The mean
// daily population is animal_days / days_in_month.
func (f *facts) mortalityFacts() {
	if !f.set.Present["deaths.csv"] {
		return
	}
	type key struct {
		building string
		month    records.Day // first day of the month
	}
	type month struct {
		deaths []any
	}
	months := map[key]*month{}
	first := monthStart(f.period.From)
	for i := range f.set.Deaths {
		dr := &f.set.Deaths[i]
		a := f.animals[dr.AnimalID]
		day := records.DayOf(dr.FoundDeadAt)
		if a == nil || day < first || day > f.period.To {
			continue
		}
		b := f.buildingOn(a, day)
		if b == "" {
			continue
		}
		k := key{b, monthStart(day)}
		m := months[k]
		if m == nil {
			m = &month{}
			months[k] = m
		}
		m.deaths = append(m.deaths, map[string]any{"animal": a.ID, "on": day.String(), "ref": string(dr.Ref)})
	}
	keys := make([]key, 0, len(months))
	for k := range months {
		keys = append(keys, k)
	}
	sort.Slice(keys, func(i, j int) bool {
		if keys[i].building != keys[j].building {
			return keys[i].building < keys[j].building
		}
		return keys[i].month < keys[j].month
	})
	out := []any{}
	for _, k := range keys {
		last := nextMonth(k.month) - 1
		animalDays := 0
		for _, iv := range f.allStays() {
			if f.enclosures[iv.enclosure] == nil || f.enclosures[iv.enclosure].BuildingID != k.building {
				continue
			}
			from, to := max(iv.from, k.month), min(iv.to, last)
			if to >= from {
				animalDays += int(to-from) + 1
			}
		}
		out = append(out, map[string]any{
			"building": k.building, "month": k.month.String()[:7], "on": k.month.String(),
			"deaths": len(months[k].deaths), "death_list": months[k].deaths,
			"animal_days": animalDays, "days_in_month": int(last-k.month) + 1,
		})
	}
	f.doc("facility", f.set.Facility.Name)["mortality"] = out
}

func monthStart(d records.Day) records.Day {
	t := d.Time()
	return records.MakeDay(t.Year(), t.Month(), 1)
}

func nextMonth(first records.Day) records.Day { return first.AddMonths(1) }

// residence is one animal in one enclosure from..to inclusive, not clipped
// to the period (to is far in the future while it is still there).
type residence struct {
	animal, enclosure string
	from, to          records.Day
}

// allStays places every animal in its enclosures over all time, as
// buildStays does for the period: housing.csv when present, else the home
// enclosure; the stay ends on the animal's last day (left_on, or its death).
func (f *facts) allStays() []residence {
	if f.residences != nil {
		return f.residences
	}
	const open = records.Day(1 << 30)
	end := func(a *records.Animal, to records.Day) records.Day {
		if to.IsZero() {
			to = open
		}
		if !a.LeftOn.IsZero() && a.LeftOn < to {
			to = a.LeftOn
		}
		if dd, ok := f.deathDay[a.ID]; ok && dd < to {
			to = dd
		}
		return to
	}
	out := []residence{}
	if f.set.Present["housing.csv"] {
		for i := range f.set.Housing {
			h := &f.set.Housing[i]
			a := f.animals[h.AnimalID]
			if a == nil {
				continue
			}
			to := h.MovedOutOn
			if !to.IsZero() {
				to--
			}
			out = append(out, residence{a.ID, h.EnclosureID, max(h.MovedInOn, a.ArrivedOn), end(a, to)})
		}
	} else {
		for i := range f.set.Animals {
			a := &f.set.Animals[i]
			if a.EnclosureID != "" {
				out = append(out, residence{a.ID, a.EnclosureID, a.ArrivedOn, end(a, 0)})
			}
		}
	}
	f.residences = out
	return out
}

// buildingOn is the building the animal was in on day d ("" when unknown);
// on the day it moved it is in its new enclosure.
func (f *facts) buildingOn(a *records.Animal, d records.Day) string {
	b := ""
	for _, r := range f.allStays() {
		if r.animal == a.ID && r.from <= d && d <= r.to {
			if e := f.enclosures[r.enclosure]; e != nil {
				b = e.BuildingID
			}
		}
	}
	return b
}

// litterFacts adds to each dam's document its "litters" weaned in the
// period: the weaning age in days, the counts, and the dam's species (whose
// minimum weaning age is in the limits).
func (f *facts) litterFacts() {
	for i := range f.set.Litters {
		l := &f.set.Litters[i]
		a := f.animals[l.DamID]
		if a == nil || l.WeanedOn.IsZero() || !f.inPeriod(l.WeanedOn) {
			continue
		}
		d := f.animalDoc(a)
		if _, ok := d["litters"]; !ok {
			d["litters"] = []any{}
		}
		var alive, weaned any
		if l.BornAlive != nil {
			alive = *l.BornAlive
		}
		if l.Weaned != nil {
			weaned = *l.Weaned
		}
		appendHealth(d, "litters", map[string]any{
			"id": l.ID, "ref": string(l.Ref), "species": a.Species,
			"whelped_on": l.WhelpedOn.String(), "weaned_on": l.WeanedOn.String(),
			"age_days": int(l.WeanedOn - l.WhelpedOn),
			"born":     l.Born, "born_alive": alive, "weaned": weaned,
		})
	}
}
