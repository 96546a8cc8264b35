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

	type event struct {
		animal, what string
		day          records.Day
		ref          records.Ref
	}
	var events []event
	for i := range f.set.Handling {
		h := &f.set.Handling[i]
		events = append(events, event{h.AnimalID, "handling (" + h.Purpose + ")", records.DayOf(h.At), h.Ref})
	}
	for i := range f.set.Culls {
		c := &f.set.Culls[i]
		events = append(events, event{c.AnimalID, "cull", records.DayOf(c.At), c.Ref})
	}
	for i := range f.set.Observations {
		o := &f.set.Observations[i]
		events = append(events, event{o.AnimalID, "observation", records.DayOf(o.At), o.Ref})
	}
	for i := range f.rounds.Len() {
		if r := f.rounds.View(i); r.ConcernAnimalID != "" {
			events = append(events, event{r.ConcernAnimalID, "health concern", r.Day, f.rounds.Ref(i)})
		}
	}
	for _, e := range events {
		a := f.animals[e.animal]
		if a == nil || !f.inPeriod(e.day) {
			continue
		}
		if e.day < a.ArrivedOn || (!a.LeftOn.IsZero() && e.day > a.LeftOn) {
			d := f.animalDoc(a)
			d["outside_stay"] = append(d["outside_stay"].([]any), map[string]any{
				"on": e.day.String(), "what": e.what, "ref": string(e.ref),
			})
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
