package checker

import (
	"slices"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
)

func TestCullFacts(t *testing.T) {
	// Method classes for foxes and mink as in the shipped limits, recalled
	// from the AVMA Guidelines for the Euthanasia of Animals (2020) — from memory.
	tests := []struct {
		name, species, method string
		confirmation          []string
		wantClass             string
		wantCond              map[string]any
		wantSigns             int
	}{
		{"barbiturate for a fox", "vulpes_vulpes", "barbiturate_overdose", []string{"no_heartbeat", "no_breathing"}, "acceptable",
			map[string]any{"sedation": false, "general_anaesthesia": false, "secondary_method": false, "note": nil}, 2},
		{"captive bolt needs a secondary method", "vulpes_vulpes", "penetrating_captive_bolt", []string{"secondary_method"}, "conditional",
			map[string]any{"sedation": false, "general_anaesthesia": false, "secondary_method": true, "note": nil}, 1},
		// culls.csv anaesthetised (records.md "New in this contract"): potassium chloride
		// is acceptable only under general anaesthesia — AVMA (2020), from memory.
		{"potassium chloride only under anaesthesia", "vulpes_lagopus", "potassium_chloride", nil, "conditional",
			map[string]any{"sedation": false, "general_anaesthesia": true, "secondary_method": false, "note": "only under general anaesthesia"}, 0},
		{"cervical dislocation of a fox", "vulpes_vulpes", "cervical_dislocation", nil, "unacceptable",
			map[string]any{"sedation": false, "general_anaesthesia": false, "secondary_method": false, "note": nil}, 0},
		{"carbon dioxide for mink", "neogale_vison", "carbon_dioxide", nil, "conditional",
			map[string]any{"sedation": false, "general_anaesthesia": false, "secondary_method": false, "note": "purpose-built chamber, compressed gas"}, 0},
		{"carbon dioxide for a fox is not listed", "vulpes_vulpes", "carbon_dioxide", nil, "unlisted",
			map[string]any{"sedation": false, "general_anaesthesia": false, "secondary_method": false, "note": nil}, 0},
		{"a sign written twice counts once", "vulpes_vulpes", "barbiturate_overdose", []string{"no_heartbeat", "no_heartbeat"}, "acceptable",
			map[string]any{"sedation": false, "general_anaesthesia": false, "secondary_method": false, "note": nil}, 1},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			set := peopleSet(t)
			set.Animals[1].Species = tt.species
			set.Culls = []records.Cull{{Ref: "culls.csv:2", At: ptime(t, "2026-01-20 11:00"), AnimalID: "F2", StaffID: "S3",
				Method: tt.method, Sedated: records.No, DeathConfirmed: records.Yes, Confirmation: tt.confirmation}}
			f := newFacts(set, peopleLimits(t), peoplePeriod)
			f.cullFacts()
			conf := []string{}
			for _, c := range tt.confirmation {
				if !slices.Contains(conf, c) {
					conf = append(conf, c)
				}
			}
			want := []any{map[string]any{
				"on": "2026-01-20", "ref": "culls.csv:2", "staff": "S3", "method": tt.method, "class": tt.wantClass,
				"conditions": tt.wantCond, "sedated": false, "anaesthetised": false, "death_confirmed": true, "confirmation": strs(conf), "signs": tt.wantSigns,
			}}
			if diff := cmp.Diff(want, f.docs["animal"]["F2"]["euthanasia"]); diff != "" {
				t.Errorf("euthanasia facts (-want +got):\n%s", diff)
			}
		})
	}
}

func TestCullFactsAnaesthetised(t *testing.T) {
	// culls.csv gains anaesthetised (records.md "New in this contract"); the
	// facts carry it apart from sedated, since potassium chloride is acceptable
	// only under general anaesthesia — AVMA (2020), from memory.
	for _, tt := range []struct {
		name               string
		sedated, anaesth   records.Bool
		wantSed, wantAnaes bool
	}{
		{"sedated only", records.Yes, records.No, true, false},
		{"anaesthetised", records.No, records.Yes, false, true},
		{"not recorded", records.NotRecorded, records.NotRecorded, false, false},
	} {
		t.Run(tt.name, func(t *testing.T) {
			set := peopleSet(t)
			set.Culls = []records.Cull{{Ref: "culls.csv:2", At: ptime(t, "2026-01-20 11:00"), AnimalID: "F2", StaffID: "S3",
				Method: "potassium_chloride", Sedated: tt.sedated, Anaesthetised: tt.anaesth}}
			f := newFacts(set, peopleLimits(t), peoplePeriod)
			f.cullFacts()
			ev := f.docs["animal"]["F2"]["euthanasia"].([]any)[0].(map[string]any)
			got := []any{ev["sedated"], ev["anaesthetised"], ev["conditions"].(map[string]any)["general_anaesthesia"]}
			if diff := cmp.Diff([]any{tt.wantSed, tt.wantAnaes, true}, got); diff != "" {
				t.Errorf("sedated, anaesthetised, needs general anaesthesia (-want +got):\n%s", diff)
			}
		})
	}
}
