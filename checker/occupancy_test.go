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
