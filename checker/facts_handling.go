package checker

import (
	"strings"

	"welfare/records"
)

// handlingFacts adds to each handled animal's document its "handling"
// section: one entry per handling row of the period, with what the row
// recorded. The rules judge it against the species' bite risk and the
// handling limits (gloves, PPE, duration, bite reporting), so a committee
// that edits the limits edits the checks.
func (f *facts) handlingFacts() {
	// A year of rows names the same days, people, purposes and PPE lists
	// again and again: each is one document value shared by every entry.
	days := newDayValues(f.period)
	texts := map[string]any{}
	text := func(s string) any {
		v, ok := texts[s]
		if !ok {
			v = s
			texts[s] = v
		}
		return v
	}
	ppes := map[string][]any{}
	ppe := func(list []string) []any {
		k := strings.Join(list, "\x00")
		v, ok := ppes[k]
		if !ok {
			v = strs(list)
			ppes[k] = v
		}
		return v
	}
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
			"on":                   days.of(day),
			"at":                   h.At.Format("2006-01-02 15:04"),
			"ref":                  string(h.Ref),
			"staff":                text(h.StaffID),
			"purpose":              text(h.Purpose),
			"restraint":            orNull(text(h.Restraint), h.Restraint),
			"glove":                orNull(text(h.Glove), h.Glove),
			"glove_thickness_mm":   num(h.GloveThicknessMm),
			"ppe":                  ppe(h.PPE),
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

// orNull is v, or null when the text s it stands for is empty.
func orNull(v any, s string) any {
	if s == "" {
		return nil
	}
	return v
}
