package checker

import (
	"welfare/records"
)

// recordsFacts adds the record-keeping facts: the facility's rejected rows,
// and per animal the events dated outside its stay at the facility and its
// culls, for the departure bookkeeping to be compared.
func (f *facts) recordsFacts() {
	rejected := make([]any, 0, len(f.set.Problems))
	for _, p := range f.set.Problems {
		ref := string(p.Row())
		rejected = append(rejected, map[string]any{
			"ref": ref, "file": p.File, "line": p.Line, "column": p.Column, "value": p.Value,
			"reason": p.Reason, "on": dayOrNull(p.Day), "message": p.Error(),
		})
	}
	fd := f.doc("facility", f.set.Facility.Name)
	fd["rejected"] = rejected
	fd["period"] = map[string]any{"from": f.period.From.String(), "until": f.period.To.String()}

	// An event dated outside its animal's stay: each row is judged where it
	// is read, and its text and ref are made only for the few that are.
	outside := func(a *records.Animal, day records.Day) bool {
		return a != nil && f.inPeriod(day) && (day < a.ArrivedOn || (!a.LeftOn.IsZero() && day > a.LeftOn))
	}
	note := func(a *records.Animal, day records.Day, what string, ref records.Ref) {
		d := f.animalDoc(a)
		d["outside_stay"] = append(d["outside_stay"].([]any), map[string]any{
			"on": day.String(), "what": what, "ref": string(ref),
		})
	}
	for i := range f.set.Handling {
		h := &f.set.Handling[i]
		if a, day := f.animals[h.AnimalID], records.DayOf(h.At); outside(a, day) {
			note(a, day, "handling ("+h.Purpose+")", h.Ref)
		}
	}
	for i := range f.set.Culls {
		c := &f.set.Culls[i]
		if a, day := f.animals[c.AnimalID], records.DayOf(c.At); outside(a, day) {
			note(a, day, "cull", c.Ref)
		}
	}
	for i := range f.set.Observations {
		o := &f.set.Observations[i]
		if a, day := f.animals[o.AnimalID], records.DayOf(o.At); outside(a, day) {
			note(a, day, "observation", o.Ref)
		}
	}
	// The rounds' concern animals, resolved once per key of their table.
	strs := f.rounds.Strings()
	animalOf := make([]*records.Animal, len(strs))
	for k, id := range strs {
		if id != "" {
			animalOf[k] = f.animals[id]
		}
	}
	for _, i := range f.roundIndex().concerns {
		i := int(i)
		if a, day := animalOf[f.rounds.Keys(i).ConcernAnimal], f.rounds.Day(i); outside(a, day) {
			note(a, day, "health concern", f.rounds.Ref(i))
		}
	}

	for i := range f.set.Culls {
		c := &f.set.Culls[i]
		a := f.animals[c.AnimalID]
		if a == nil {
			continue
		}
		d := f.animalDoc(a)
		d["culls"] = append(d["culls"].([]any), map[string]any{
			"on": records.DayOf(c.At).String(), "ref": string(c.Ref),
		})
	}
	// Animals recorded as culled in the period, so a cull row that is
	// missing can be noticed.
	for i := range f.set.Animals {
		a := &f.set.Animals[i]
		if a.LeftReason == "culled" && f.inPeriod(a.LeftOn) {
			f.animalDoc(a)
		}
	}
}

// animalDoc returns an animal's document, creating it with the animal's
// record-keeping attributes.
func (f *facts) animalDoc(a *records.Animal) map[string]any {
	d := f.doc("animal", a.ID)
	if _, ok := d["species"]; !ok {
		d["species"] = a.Species
		d["arrived_on"] = a.ArrivedOn.String()
		d["left_on"] = dayOrNull(a.LeftOn)
		d["left_reason"] = nilIfEmpty(a.LeftReason)
		d["protocol"] = nilIfEmpty(a.ProtocolID)
		d["culls_recorded"] = f.set.Present["culls.csv"]
		d["outside_stay"] = []any{}
		d["culls"] = []any{}
	}
	return d
}
