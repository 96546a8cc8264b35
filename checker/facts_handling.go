package checker

import (
	"welfare/records"
)

// handlingFacts adds to each handled animal's document its "handling"
// section: one entry per handling row of the period, with what the row
// recorded. The rules judge it against the species' bite risk and the
// handling limits (gloves, PPE, duration, bite reporting), so a committee
// that edits the limits edits the checks.
func (f *facts) handlingFacts() {
	for i := range f.set.Handling {
		h := &f.set.Handling[i]
		day := records.DayOf(h.At)
		a := f.animals[h.AnimalID]
		// A row naming an unknown animal was rejected by the loader's
		// reference check and is reported as records.row.rejected.
		if a == nil || !f.inPeriod(day) {
			continue
		}
		var reported any
		if !h.ExposureReportedAt.IsZero() {
			reported = h.ExposureReportedAt.Sub(h.At).Hours()
		}
		ev := map[string]any{
			"on":                   day.String(),
			"at":                   h.At.Format("2006-01-02 15:04"),
			"ref":                  string(h.Ref),
			"staff":                h.StaffID,
			"purpose":              h.Purpose,
			"restraint":            nilIfEmpty(h.Restraint),
			"glove":                nilIfEmpty(h.Glove),
			"glove_thickness_mm":   num(h.GloveThicknessMm),
			"ppe":                  strs(h.PPE),
			"duration_min":         num(h.DurationMin),
			"bite":                 h.Bite.IsYes(),
			"scratch":              h.Scratch.IsYes(),
			"wound_washed":         h.WoundWashed.IsYes(),
			"reported_after_hours": reported,
		}
		d := f.animalDoc(a)
		list, _ := d["handling"].([]any)
		d["handling"] = append(list, ev)
	}
}
