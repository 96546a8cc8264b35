package checker

import (
	"fmt"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
)

// The cleaning gaps of one enclosure C-01 in building B (invented): each
// case gives the days its animal is there and the rounds, and the gaps the
// facts must list. The rule (rules/care.rego) turns a gap longer than
// clean_every_days into a finding; here only the measurement is tested.
func TestCleaningGaps(t *testing.T) {
	type round struct {
		day      string
		building bool // a building round: a round of each of its enclosures
		cleaned  bool
	}
	type gap struct{ From, Until, Since string }
	period := Period{From: coldDay("2026-07-01"), To: coldDay("2026-07-31")}
	tests := []struct {
		name          string
		arrived, left string
		rounds        []round
		want          []gap
	}{
		{"no rounds: nothing to count from", "2026-01-01", "", nil, nil},
		{"cleaned weekly by building rounds: short gaps only", "2026-01-01", "",
			[]round{{"2026-07-01", true, true}, {"2026-07-08", true, true}, {"2026-07-15", true, true}, {"2026-07-22", true, true}, {"2026-07-29", true, true}},
			[]gap{{"2026-07-01", "2026-07-07", "cleaned"}, {"2026-07-08", "2026-07-14", "cleaned"}, {"2026-07-15", "2026-07-21", "cleaned"},
				{"2026-07-22", "2026-07-28", "cleaned"}, {"2026-07-29", "2026-07-31", "cleaned"}}},
		{"cleaning before the period counts; a round without cleaning does not", "2026-01-01", "",
			[]round{{"2026-06-20", false, true}, {"2026-07-05", false, false}, {"2026-07-10", false, true}},
			[]gap{{"2026-06-20", "2026-07-09", "cleaned"}, {"2026-07-10", "2026-07-31", "cleaned"}}},
		{"never cleaned: counted from the first round", "2026-01-01", "",
			[]round{{"2026-07-03", false, false}},
			[]gap{{"2026-07-03", "2026-07-31", "first_round"}}},
		{"occupied after the first round: counted from the occupancy", "2026-07-10", "",
			[]round{{"2026-07-01", true, true}, {"2026-07-20", false, false}},
			[]gap{{"2026-07-10", "2026-07-31", "occupancy"}}},
		{"empty after departure: the gap ends with the stay", "2026-01-01", "2026-07-12",
			[]round{{"2026-07-01", false, true}},
			[]gap{{"2026-07-01", "2026-07-12", "cleaned"}}},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			set := &records.Set{
				Facility:   records.Facility{Name: "Birchfall Fur Research Station", Buildings: []records.Building{{ID: "B", Exposure: "indoor"}}},
				Location:   coldZone,
				Present:    map[string]bool{"daily_care.csv": true},
				Enclosures: []records.Enclosure{{Ref: "enclosures.csv:2", ID: "C-01", BuildingID: "B", Kind: "cage", FloorAreaM2: fp(2), HeightCm: 90}},
				Animals: []records.Animal{{Ref: "animals.csv:2", ID: "A-1", Species: "vulpes_vulpes", ArrivedOn: coldDay(tc.arrived),
					EnclosureID: "C-01", LifeStage: "adult"}},
			}
			if tc.left != "" {
				set.Animals[0].LeftOn, set.Animals[0].LeftReason = coldDay(tc.left), "transferred"
			}
			for i, r := range tc.rounds {
				cr := records.CareRound{Ref: records.Ref(fmt.Sprintf("daily_care.csv:%d", i+2)), At: coldAt(r.day, "08:00"), Day: coldDay(r.day),
					EnclosureID: "C-01", StaffID: "K-1", Observed: records.Yes, Cleaned: records.No}
				if r.building {
					cr.EnclosureID, cr.BuildingID = "", "B"
				}
				if r.cleaned {
					cr.Cleaned = records.Yes
				}
				set.Care = append(set.Care, cr)
			}
			f := newFacts(set, defaultLimits(t), period)
			f.cleaningFacts()
			var got []gap
			for _, g := range section(f.docs["enclosure"]["C-01"], "cleaning").(map[string]any)["gaps"].([]any) {
				m := g.(map[string]any)
				got = append(got, gap{m["from"].(string), m["until"].(string), m["since"].(string)})
			}
			if diff := cmp.Diff(tc.want, got); diff != "" {
				t.Errorf("gaps (-want +got):\n%s", diff)
			}
		})
	}
}

// The report's cleaning gaps are read from the builder's data without
// making the sections (cleaningGaps): they are the gaps of the sections
// made, enclosure for enclosure.
func TestCleaningGapsWithoutMakingSections(t *testing.T) {
	for name, f := range documentSets(t) {
		encs := f.docs["enclosure"]
		made := make(map[string]map[string]any, len(encs))
		for id, d := range encs {
			made[id] = resolveDoc(d)
		}
		got, want := cleaningGaps(encs), cleaningGaps(made)
		if len(want) == 0 {
			t.Errorf("%s: no cleaning gaps to compare", name)
		}
		if diff := cmp.Diff(want, got); diff != "" {
			t.Errorf("%s: gaps from the sections made (-) and from the builder's data (+):\n%s", name, diff)
		}
	}
}

// A place's cleaning rounds are ordered by day, then ref as text (so
// "daily_care.csv:10" comes before "daily_care.csv:9"), their days moving
// with their refs.
func TestSortCleaned(t *testing.T) {
	d1, d2 := coldDay("2026-07-01"), coldDay("2026-07-02")
	refs := []records.Ref{"daily_care.csv:9", "daily_care.csv:10", "daily_care.csv:3", "daily_care.csv:2"}
	on := []records.Day{d2, d2, d1, d1}
	sortCleaned(refs, on)
	wantRefs := []records.Ref{"daily_care.csv:2", "daily_care.csv:3", "daily_care.csv:10", "daily_care.csv:9"}
	if diff := cmp.Diff(wantRefs, refs); diff != "" {
		t.Errorf("refs (-want +got):\n%s", diff)
	}
	if diff := cmp.Diff([]records.Day{d1, d1, d2, d2}, on); diff != "" {
		t.Errorf("days (-want +got):\n%s", diff)
	}
}
