package checker

import (
	"bytes"
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
	"welfare/rules"
)

func defaultLimits(t testing.TB) *rules.Limits {
	t.Helper()
	l, err := rules.LoadLimits(bytes.NewReader(rules.DefaultLimits()), "limits.yaml")
	if err != nil {
		t.Fatal(err)
	}
	return l
}

func f64(x float64) *float64 { return &x }

// The required areas against the published figures.
func TestRequiredAreaPublishedFigures(t *testing.T) {
	f := &facts{lim: defaultLimits(t)}
	fox := func(stage string) occupant {
		return occupant{Animal: &records.Animal{Species: "vulpes_vulpes"}, Stage: stage}
	}
	tests := []struct {
		name   string
		occ    []occupant
		wantM2 float64
	}{
		// Council of Europe fur-animal recommendation (1999) as in Czech Decree 208/2004 §13 and
		// Finnish rules: adult fox ≥ 0.8 m².
		{"adult red fox", []occupant{fox("adult")}, 0.8},
		// Same source: two weaned cubs ≥ 1.2 m².
		{"two weaned cubs", []occupant{fox("juvenile"), fox("juvenile")}, 1.2},
		// Same source: vixen with litter ≥ 2.0 m²; the litter is covered by the vixen's figure.
		{"vixen with litter", []occupant{fox("dam_with_litter"), fox("juvenile"), fox("juvenile"), fox("juvenile")}, 2.0},
		// Same source, mink: ≥ 2,550 cm² (0.255 m²).
		{"mink", []occupant{{Animal: &records.Animal{Species: "neogale_vison"}, Stage: "adult"}}, 0.255},
		// Same source (references.md "Space", mink): 2,550 cm² for two weaned young,
		// so 0.1275 m² each — two in 0.255 m² pass.
		{"two weaned mink", []occupant{{Animal: &records.Animal{Species: "neogale_vison"}, Stage: "juvenile"}, {Animal: &records.Animal{Species: "neogale_vison"}, Stage: "juvenile"}}, 0.255},
		// Same source: 2,550 cm² for a dam with her litter.
		{"mink dam with litter", []occupant{{Animal: &records.Animal{Species: "neogale_vison"}, Stage: "dam_with_litter"}, {Animal: &records.Animal{Species: "neogale_vison"}, Stage: "juvenile"}}, 0.255},
		// Same source: adult arctic fox ≥ 0.8 m².
		{"arctic fox", []occupant{{Animal: &records.Animal{Species: "vulpes_lagopus"}, Stage: "adult"}}, 0.8},
		// US 9 CFR §3.6(c)(1): (31 in + 6)² / 144 = 9.51 ft² for a 31-inch dog
		// (USDA Animal Care tech note, from memory) = 0.8834 m² (NIST SP 811: 1 ft² = 0.09290304 m²).
		{"31-inch dog", []occupant{{Animal: &records.Animal{Species: "canis_familiaris", LengthCm: f64(31 * 2.54)}, Stage: "adult"}}, 9.506944 * 0.09290304},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			var got float64
			for _, o := range tc.occ {
				a, ok := f.requiredArea(o, tc.occ)
				if !ok {
					t.Fatalf("no area for %+v", o)
				}
				got += a
			}
			if math.Abs(got-tc.wantM2) > 1e-6 {
				t.Errorf("required area = %.6f m², want %.6f m²", got, tc.wantM2)
			}
		})
	}
	// 9 CFR §3.6(c)(1) printed to two decimals: 9.51 ft².
	if ft2 := dogAreaM2(31*2.54) / 0.09290304; math.Round(ft2*100)/100 != 9.51 {
		t.Errorf("31-inch dog = %.4f ft², want 9.51", ft2)
	}
	// Dogs' space (checks.md "Corrections to the first set"; references.md "Space").
	dog := func(stage string, lengthIn, kg float64) occupant {
		a := &records.Animal{Species: "canis_familiaris", LengthCm: f64(lengthIn * 2.54)}
		if kg > 0 {
			a.MassKg = f64(kg)
		}
		return occupant{Animal: a, Stage: stage}
	}
	ft2 := 0.09290304 // NIST SP 811: 1 ft² = 0.09290304 m²
	for _, tc := range []struct {
		name   string
		occ    []occupant
		wantM2 float64
	}{
		// 9 CFR §3.6(c)(1): a 31-inch dog alone, 9.51 ft² (37²/144).
		{"31-inch dog alone", []occupant{dog("adult", 31, 20)}, 37.0 * 37 / 144 * ft2},
		// Guide, 8th ed., Table 3.3, dogs in pairs: 20 kg → 1.2 m² each where larger than
		// the formula; a 20-inch dog's formula is 26²/144 = 4.69 ft² = 0.436 m², so 1.2 each.
		{"two 20 kg dogs", []occupant{dog("adult", 20, 20), dog("adult", 20, 20)}, 2 * 1.2},
		// Same table: < 15 kg 0.74 m², > 30 kg 2.4 m²; 15 kg and 30 kg exactly are 1.2 m².
		{"14.9 kg and 30.1 kg dogs", []occupant{dog("adult", 20, 14.9), dog("adult", 20, 30.1)}, 0.74 + 2.4},
		{"15 kg and 30 kg dogs", []occupant{dog("adult", 20, 15), dog("adult", 20, 30)}, 1.2 + 1.2},
		// Same table, where larger: a 40-inch dog's formula (46²/144 = 14.69 ft² = 1.365 m²)
		// beats 1.2 m² for 25 kg.
		{"long dog in a pair", []occupant{dog("adult", 40, 25), dog("adult", 20, 25)}, 46.0*46/144*ft2 + 1.2},
		// 9 CFR §3.6(c)(1)(ii): the bitch's formula plus 5 % (limits [M]) per nursing puppy;
		// the puppies need nothing of their own.
		{"bitch with three puppies", []occupant{dog("dam_with_litter", 31, 20), dog("juvenile", 8, 1), dog("juvenile", 8, 1), dog("juvenile", 8, 1)},
			37.0 * 37 / 144 * ft2 * 1.15},
	} {
		var got float64
		for _, o := range tc.occ {
			a, ok := f.requiredArea(o, tc.occ)
			if !ok {
				t.Fatalf("%s: no area for %+v", tc.name, o.Animal)
			}
			got += a
		}
		if math.Abs(got-tc.wantM2) > 1e-6 {
			t.Errorf("%s: required area = %.6f m², want %.6f m²", tc.name, got, tc.wantM2)
		}
	}
	// A dog in a pair without a recorded mass cannot be judged against the Guide's figures.
	pair := []occupant{dog("adult", 20, 0), dog("adult", 20, 20)}
	if _, ok := f.requiredArea(pair[0], pair); ok {
		t.Error("a grouped dog without mass got a required area")
	}
	// Same source: no mink cage below 0.255 m², no fox cage below 0.8 m²,
	// whatever the occupants (checks.md "Corrections to the first set").
	for sp, want := range map[string]float64{"neogale_vison": 0.255, "vulpes_vulpes": 0.8, "vulpes_lagopus": 0.8} {
		if got := f.lim.Species[sp].Space.MinCageM2; got != want {
			t.Errorf("%s min_cage_m2 = %v, want %v", sp, got, want)
		}
	}
	// A dog without a recorded length has no formula value: unknown, not zero.
	if _, ok := f.requiredArea(occupant{Animal: &records.Animal{Species: "canis_familiaris"}, Stage: "adult"}, nil); ok {
		t.Error("a dog without length got a required area")
	}
}

// Minimum heights: Council of Europe recommendation as implemented in Czech Decree
// 208/2004 §13 — fox cages ≥ 70 cm, mink ≥ 45 cm.
func TestMinimumHeightsInLimits(t *testing.T) {
	l := defaultLimits(t)
	for sp, want := range map[string]float64{"vulpes_vulpes": 70, "vulpes_lagopus": 70, "neogale_vison": 45} {
		if got := l.Species[sp].Space.MinHeightCm; got != want {
			t.Errorf("%s min height = %v cm, want %v", sp, got, want)
		}
	}
}

// Occupancy: a move counts in the new enclosure on the move day, a cub
// becomes an adult at six months, and the period clips the stays.
func TestOccupancySegments(t *testing.T) {
	d := func(s string) records.Day {
		day, err := records.ParseDay(s)
		if err != nil {
			t.Fatal(err)
		}
		return day
	}
	cub := records.Animal{ID: "RF-1", Species: "vulpes_vulpes", BornOn: d("2025-07-20"), ArrivedOn: d("2025-07-20"), Ref: "animals.csv:2"}
	adult := records.Animal{ID: "RF-2", Species: "vulpes_vulpes", ArrivedOn: d("2024-05-01"), Ref: "animals.csv:3"}
	set := &records.Set{
		Animals:    []records.Animal{cub, adult},
		Enclosures: []records.Enclosure{{ID: "A", BuildingID: "S1"}, {ID: "B", BuildingID: "S1"}},
		Housing: []records.Housing{
			{AnimalID: "RF-1", EnclosureID: "A", MovedInOn: d("2025-07-20"), Ref: "housing.csv:2"},
			{AnimalID: "RF-2", EnclosureID: "B", MovedInOn: d("2024-05-01"), MovedOutOn: d("2026-01-10"), Ref: "housing.csv:3"},
			{AnimalID: "RF-2", EnclosureID: "A", MovedInOn: d("2026-01-10"), Ref: "housing.csv:4"},
		},
		Present: map[string]bool{"housing.csv": true},
	}
	f := newFacts(set, defaultLimits(t), Period{From: d("2026-01-01"), To: d("2026-01-31")})
	type seg struct {
		From, To string
		Who      []string
	}
	flat := func(id string) []seg {
		var out []seg
		for _, s := range f.segments[id] {
			var who []string
			for _, o := range s.Occupants {
				who = append(who, o.Animal.ID+" "+o.Stage)
			}
			out = append(out, seg{s.From.String(), s.To.String(), who})
		}
		return out
	}
	// Born 2025-07-20, juvenile under 6 months (limits juveniles.under_months,
	// common practice): adult from 2026-01-20.
	wantA := []seg{
		{"2026-01-01", "2026-01-09", []string{"RF-1 juvenile"}},
		{"2026-01-10", "2026-01-19", []string{"RF-1 juvenile", "RF-2 adult"}},
		{"2026-01-20", "2026-01-31", []string{"RF-1 adult", "RF-2 adult"}},
	}
	if diff := cmp.Diff(wantA, flat("A")); diff != "" {
		t.Errorf("enclosure A (-want +got):\n%s", diff)
	}
	wantB := []seg{{"2026-01-01", "2026-01-09", []string{"RF-2 adult"}}}
	if diff := cmp.Diff(wantB, flat("B")); diff != "" {
		t.Errorf("enclosure B (-want +got):\n%s", diff)
	}
	if f.occupied("B", d("2026-01-10")) {
		t.Error("B counted as occupied on the move-out day")
	}
}
