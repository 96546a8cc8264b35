package checker

import (
	"math"
	"sort"

	"welfare/records"
	"welfare/rules"
)

// segment is a run of days, From to To inclusive, on which an enclosure has
// the same occupants at the same life stages. Enclosures change occupants
// rarely, so a year of one enclosure is usually one or two segments: the
// rules see runs, not 365 days.
type segment struct {
	From, To  records.Day
	Occupants []occupant
}

type occupant struct {
	Animal *records.Animal
	Stage  string
	Ref    records.Ref
}

// occupancy cuts an enclosure's stays into segments at every arrival,
// departure and birthday that makes a juvenile an adult.
func (f *facts) occupancy(e *records.Enclosure, ss []stay) []segment {
	if len(ss) == 0 {
		return nil
	}
	var cuts []records.Day
	for _, s := range ss {
		cuts = append(cuts, s.From, s.To+1)
		if a := s.Animal; a.LifeStage == "" && !a.BornOn.IsZero() {
			if grown := a.BornOn.AddMonths(f.lim.Juveniles.UnderMonths); grown > s.From && grown <= s.To {
				cuts = append(cuts, grown)
			}
		}
	}
	sort.Slice(cuts, func(i, j int) bool { return cuts[i] < cuts[j] })
	var out []segment
	for i := 0; i+1 < len(cuts); i++ {
		from, to := cuts[i], cuts[i+1]-1
		if from > to {
			continue
		}
		var occ []occupant
		for _, s := range ss {
			if s.From <= from && from <= s.To {
				occ = append(occ, occupant{Animal: s.Animal, Stage: f.lifeStage(s.Animal, from), Ref: s.Ref})
			}
		}
		if len(occ) == 0 {
			continue
		}
		if n := len(out); n > 0 && out[n-1].To+1 == from && sameOccupants(out[n-1].Occupants, occ) {
			out[n-1].To = to
			continue
		}
		out = append(out, segment{From: from, To: to, Occupants: occ})
	}
	return out
}

func sameOccupants(a, b []occupant) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i].Animal != b[i].Animal || a[i].Stage != b[i].Stage {
			return false
		}
	}
	return true
}

// occupied reports whether the enclosure has an occupant on day d.
func (f *facts) occupied(encID string, d records.Day) bool {
	return f.segmentOn(encID, d) != nil
}

// segmentOn returns the enclosure's segment covering d, or nil.
func (f *facts) segmentOn(encID string, d records.Day) *segment {
	segs := f.segments[encID]
	i := sort.Search(len(segs), func(i int) bool { return segs[i].To >= d })
	if i < len(segs) && segs[i].From <= d {
		return &segs[i]
	}
	return nil
}

// dogAreaM2 is US 9 CFR §3.6(c)(1): floor space in ft² = (length of the dog
// in inches, nose to tail base, + 6)² / 144, converted to m².
func dogAreaM2(lengthCm float64) float64 {
	in := lengthCm / 2.54
	ft2 := math.Pow(in+6, 2) / 144
	return ft2 * 0.09290304
}

// requiredArea is the floor area an occupant needs, in m², and whether it is
// known (a dog without a recorded length has no formula value).
// A juvenile kept with a dam with litter of its species needs nothing of its
// own: the dam's figure is for the whole litter.
func (f *facts) requiredArea(o occupant, all []occupant) (float64, bool) {
	sp, ok := f.lim.Species[o.Animal.Species]
	if !ok {
		return 0, false
	}
	if sp.Space.Formula == "9cfr_3_6_dog" {
		return formulaArea(sp.Space, o, all)
	}
	switch o.Stage {
	case "dam_with_litter":
		return sp.Space.DamWithLitterM2, true
	case "juvenile":
		for _, p := range all {
			if p.Stage == "dam_with_litter" && p.Animal.Species == o.Animal.Species {
				return 0, true
			}
		}
		return sp.Space.JuvenileM2, true
	}
	return sp.Space.AdultM2, true
}

// formulaArea is the area a dog needs: the 9 CFR §3.6(c)(1) formula; for a
// dam with litter, nursing_puppy_pct of it more per juvenile of her species
// sharing the enclosure (§3.6(c)(1)(ii)); a juvenile with its dam needs
// nothing of its own; and, housed with another of its species, the larger
// of the formula and the group figure for its mass (Guide, 8th ed., Table
// 3.3). The area is unknown without a length, or without a mass when the
// group figure applies.
func formulaArea(sp rules.Space, o occupant, all []occupant) (float64, bool) {
	same, young := 0, 0
	damPresent := false
	for _, p := range all {
		if p.Animal.Species != o.Animal.Species {
			continue
		}
		same++
		if p.Stage == "juvenile" {
			young++
		}
		if p.Stage == "dam_with_litter" {
			damPresent = true
		}
	}
	if o.Stage == "juvenile" && damPresent {
		return 0, true
	}
	if o.Animal.LengthCm == nil {
		return 0, false
	}
	area := dogAreaM2(*o.Animal.LengthCm)
	if o.Stage == "dam_with_litter" {
		area += area * sp.NursingPuppyPct / 100 * float64(young)
		return area, true
	}
	if g := sp.Group; g != nil && same > 1 {
		if o.Animal.MassKg == nil {
			return 0, false
		}
		m, per := *o.Animal.MassKg, g.MediumM2
		switch {
		case m < g.SmallBelowKg:
			per = g.SmallM2
		case m > g.LargeAboveKg:
			per = g.LargeM2
		}
		area = math.Max(area, per)
	}
	return area, true
}
