package checker

import (
	"slices"
	"welfare/records"
)

// cullFacts adds each culled animal's "euthanasia" section: one entry per
// cull row of the period with the method's class for the species in the
// limits (acceptable, conditional, unacceptable, or unlisted — which the
// rules treat as unacceptable), the conditions a conditional method
// carries, and how death was confirmed.
func (f *facts) cullFacts() {
	for i := range f.set.Culls {
		c := &f.set.Culls[i]
		day := records.DayOf(c.At)
		a := f.animals[c.AnimalID]
		if a == nil || !f.inPeriod(day) {
			continue
		}
		class, cond := "unlisted", map[string]any{"sedation": false, "general_anaesthesia": false, "secondary_method": false, "note": nil}
		if sp, ok := f.lim.Species[a.Species]; ok {
			e := sp.Euthanasia
			if mc, ok := e.Conditional[c.Method]; ok {
				class = "conditional"
				cond = map[string]any{"sedation": mc.Sedation, "general_anaesthesia": mc.GeneralAnaesthesia, "secondary_method": mc.SecondaryMethod, "note": nilIfEmpty(mc.Note)}
			}
			switch {
			case slices.Contains(e.Acceptable, c.Method):
				class = "acceptable"
			case slices.Contains(e.Unacceptable, c.Method):
				class = "unacceptable"
			}
		}
		signs := []string{}
		for _, s := range c.Confirmation {
			if !slices.Contains(signs, s) {
				signs = append(signs, s)
			}
		}
		ev := map[string]any{
			"on":              day.String(),
			"ref":             string(c.Ref),
			"staff":           c.StaffID,
			"method":          c.Method,
			"class":           class,
			"conditions":      cond,
			"sedated":         c.Sedated.IsYes(),
			"anaesthetised":   c.Anaesthetised.IsYes(),
			"death_confirmed": c.DeathConfirmed.IsYes(),
			"confirmation":    strs(signs),
			"signs":           len(signs),
		}
		d := f.animalDoc(a)
		list, _ := d["euthanasia"].([]any)
		d["euthanasia"] = append(list, ev)
	}
}
