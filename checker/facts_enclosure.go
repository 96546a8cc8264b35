package checker

import (
	"math"

	"welfare/records"
	"welfare/rules"
)

// enclosureFacts gives every enclosure's document its fixed attributes and
// its occupancy segments, each with the space, height and furnishing the
// occupants need. The rules compare; the arithmetic is here.
func (f *facts) enclosureFacts() {
	for i := range f.set.Enclosures {
		e := &f.set.Enclosures[i]
		d := f.doc("enclosure", e.ID)
		b := f.buildings[e.BuildingID]
		d["building"] = e.BuildingID
		d["exposure"] = b.Exposure
		d["enclosure_kind"] = e.Kind
		d["area_m2"] = round6(e.Area())
		d["height_cm"] = e.HeightCm
		d["max_occupants"] = e.MaxOccupants // 0: no capacity set
		d["nest_box"] = e.NestBox.IsYes()
		d["platform"] = e.Platform.IsYes()

		segs := f.segments[e.ID]
		occ := make([]any, 0, len(segs))
		for _, s := range segs {
			var required, minHeight, minCage float64
			var unknown []any
			nest, platform := false, false
			people := make([]any, 0, len(s.Occupants))
			ev := []any{string(e.Ref)}
			for _, o := range s.Occupants {
				sp := f.lim.Species[o.Animal.Species]
				area, known := f.requiredArea(o, s.Occupants)
				var areaV, missing any
				if known {
					required += area
					areaV = round6(area)
				} else {
					unknown = append(unknown, o.Animal.ID)
					missing = missingForArea(o.Animal, sp.Space)
				}
				minHeight = math.Max(minHeight, sp.Space.MinHeightCm)
				minCage = math.Max(minCage, sp.Space.MinCageM2)
				nest = nest || sp.NestBox
				platform = platform || sp.Platform
				people = append(people, map[string]any{
					"animal": o.Animal.ID, "species": o.Animal.Species, "stage": o.Stage, "required_m2": areaV,
					"missing_value": missing, "animal_ref": string(o.Animal.Ref),
				})
				ev = append(ev, string(o.Ref))
			}
			occ = append(occ, map[string]any{
				"from":             f.dayValue(s.From),
				"until":            f.dayValue(s.To),
				"days":             int(s.To-s.From) + 1,
				"count":            len(s.Occupants),
				"occupants":        people,
				"required_m2":      round6(required),
				"required_unknown": orEmpty(unknown),
				"min_height_cm":    minHeight,
				"min_cage_m2":      minCage,
				"needs_nest_box":   nest,
				"needs_platform":   platform,
				"evidence":         ev,
			})
		}
		d["occupancy"] = occ
	}
}

// missingForArea names the animals.csv column whose empty value leaves an
// occupant's area unknown: length_cm for the 9 CFR §3.6(c)(1) formula,
// mass_kg for the Guide's group figure; null when no recorded value would
// give it (a species without space limits).
func missingForArea(a *records.Animal, sp rules.Space) any {
	switch {
	case sp.Formula == "":
		return nil
	case a.LengthCm == nil:
		return "length_cm"
	case a.MassKg == nil:
		return "mass_kg"
	}
	return nil
}

// round6 drops float noise from sums of areas (0.255 × 3) so that a cage of
// exactly the required size is not reported short by 1e-16 m².
func round6(x float64) float64 { return math.Round(x*1e6) / 1e6 }

func orEmpty(xs []any) []any {
	if xs == nil {
		return []any{}
	}
	return xs
}
