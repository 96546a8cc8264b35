package records

import (
	"math"
	"testing"
	"time"

	"github.com/google/go-cmp/cmp"
)

const (
	deathsHead = "animal_id,found_dead_at,found_by,suspected_cause,vet_notified_at,necropsy,necropsy_ref,disposal\n"
	obsHead    = "observed_at,animal_id,staff_id,mass_kg,body_condition,signs,vet_informed,notes\n"
	treatHead  = "case_id,animal_id,opened_on,diagnosis,prescribed_by,reviewed_on,closed_on,outcome\n"
	litterHead = "litter_id,dam_id,whelped_on,born,born_alive,weaned_on,weaned\n"
)

// TestHealthFilesAccepted loads one good row of each health file and checks
// the values as decoded, units converted.
func TestHealthFilesAccepted(t *testing.T) {
	s := mustLoad(t, folder(map[string]string{
		deathsFile:       deathsHead + "A2,2026-01-13T07:40,K1,,2026-01-13T09:10,no,,rendering\n",
		observationsFile: "observed_at,animal_id,staff_id,mass_lb,body_condition,signs,vet_informed\n2026-01-05T10:00,A1,K1,11,2,wound;lameness,yes\n",
		treatmentsFile:   treatHead + "C-1,A1,2026-01-06,bite wound left foreleg,V1,2026-01-10,2026-01-20,recovered\n",
		littersFile:      litterHead + "L-1,A1,2025-05-04,5,4,2025-07-01,4\n",
	}))
	if diff := cmp.Diff([]string{}, problemLines(s)); diff != "" {
		t.Fatalf("problems (-want +got):\n%s", diff)
	}
	if len(s.Deaths) != 1 || s.Deaths[0].SuspectedCause != "" || s.Deaths[0].Necropsy != No || s.Deaths[0].Ref != "deaths.csv:2" {
		t.Errorf("deaths = %+v", s.Deaths)
	}
	o := s.Observations[0]
	// SP 811 B.8: 1 lb = 0.45359237 kg (exact), so 11 lb = 4.98951607 kg.
	if o.MassKg == nil || math.Abs(*o.MassKg-4.98951607) > 1e-9 || o.BodyCondition == nil || *o.BodyCondition != 2 ||
		!cmp.Equal(o.Signs, []string{"wound", "lameness"}) || o.VetInformed != Yes {
		t.Errorf("observation = %+v", o)
	}
	if c := s.Treatments[0]; c.ReviewedOn != MakeDay(2026, time.January, 10) || c.Outcome != "recovered" {
		t.Errorf("treatment = %+v", c)
	}
	if l := s.Litters[0]; l.Born != 5 || *l.BornAlive != 4 || *l.Weaned != 4 || l.WeanedOn != MakeDay(2025, time.July, 1) {
		t.Errorf("litter = %+v", l)
	}
	for _, f := range []string{deathsFile, observationsFile, treatmentsFile, littersFile} {
		if !s.Present[f] {
			t.Errorf("%s not present", f)
		}
	}
}

func TestHealthRowProblems(t *testing.T) {
	tests := []struct {
		name string
		over map[string]string
		want []string
	}{
		{
			name: "cause not in the list",
			over: map[string]string{deathsFile: deathsHead + "A2,2026-01-13T07:40,K1,frostbite,,,,\n"},
			want: []string{`deaths.csv:2: suspected_cause: "frostbite" is not one of unknown, injury, disease, cold, heat, whelping, fight, other`},
		},
		{
			name: "vet told before the animal was found",
			over: map[string]string{deathsFile: deathsHead + "A2,2026-01-13T07:40,K1,cold,2026-01-12T07:40,,,\n"},
			want: []string{`deaths.csv:2: vet_notified_at: 2026-01-12T07:40 is before found_dead_at 2026-01-13T07:40`},
		},
		{
			name: "an animal dies once",
			over: map[string]string{deathsFile: deathsHead + "A2,2026-01-13T07:40,K1,cold,,,,\nA2,2026-01-14T07:40,K1,cold,,,,\n"},
			want: []string{`deaths.csv:3: animal_id: "A2" is a duplicate; first at deaths.csv:2`},
		},
		{
			name: "body condition outside 1…5, unknown sign, mass not positive",
			over: map[string]string{observationsFile: obsHead +
				"2026-01-05T10:00,A1,K1,,6,,,\n2026-01-05T10:00,A1,K1,,,limping,,\n2026-01-05T10:00,A1,K1,0,,,,\n"},
			want: []string{
				`observations.csv:2: body_condition: 6 is outside the plausible range 1 … 5`,
				`observations.csv:3: signs: "limping" is not one of wound, lameness, eye_lesion, skin_lesion, fur_loss, fur_chewing, tail_biting, stereotypy, diarrhoea, nasal_discharge, lethargy, inappetence, other`,
				`observations.csv:4: mass_kg: 0 kg is outside the plausible range > 0 … 200 kg`,
			},
		},
		{
			name: "case closed before it opened, reviewed before it opened, outcome without closing and closing without outcome",
			over: map[string]string{treatmentsFile: treatHead +
				"C-1,A1,2026-01-06,wound,V1,,2026-01-05,recovered\n" +
				"C-2,A1,2026-01-06,wound,V1,2026-01-04,,\n" +
				"C-3,A1,2026-01-06,wound,V1,,,recovered\n" +
				"C-4,A1,2026-01-06,wound,V1,,2026-01-08,\n" +
				"C-4,A1,2026-01-06,wound,V1,,,\n"},
			want: []string{
				`treatments.csv:2: closed_on: 2026-01-05 is before opened_on 2026-01-06`,
				`treatments.csv:3: reviewed_on: 2026-01-04 is before opened_on 2026-01-06`,
				`treatments.csv:4: closed_on: is required when outcome is given`,
				`treatments.csv:5: outcome: is required when closed_on is given`,
				`treatments.csv:6: case_id: "C-4" is a duplicate; first at treatments.csv:5`,
			},
		},
		{
			name: "litter counts and dates",
			over: map[string]string{littersFile: litterHead +
				"L-1,A1,2025-05-04,5,6,,\n" +
				"L-2,A1,2025-05-04,5,4,2025-05-01,4\n" +
				"L-3,A1,2025-05-04,5,4,2025-07-01,\n" +
				"L-4,A1,2025-05-04,5,4,,4\n" +
				"L-5,A1,2025-05-04,5,4,2025-07-01,5\n" +
				"L-6,A1,2025-05-04,5,,2025-07-01,6\n" +
				"L-7,A1,2025-05-04,,,,\n"},
			want: []string{
				`litters.csv:2: born_alive: 6 is more than born (5)`,
				`litters.csv:3: weaned_on: 2025-05-01 is before whelped_on 2025-05-04`,
				`litters.csv:4: weaned: is required when weaned_on is given`,
				`litters.csv:5: weaned_on: is required when weaned is given`,
				`litters.csv:6: weaned: 5 is more than born_alive (4)`,
				`litters.csv:7: weaned: 6 is more than born (5)`,
				`litters.csv:8: born: is required but empty`,
			},
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := mustLoad(t, folder(tt.over))
			if diff := cmp.Diff(tt.want, problemLines(s)); diff != "" {
				t.Errorf("problems (-want +got):\n%s", diff)
			}
		})
	}
}

func TestHealthCrossRecord(t *testing.T) {
	tests := []struct {
		name string
		over map[string]string
		want []string
	}{
		{
			name: "unknown animal and staff",
			over: map[string]string{
				deathsFile:       deathsHead + "A9,2026-01-13T07:40,K1,cold,,,,\nA2,2026-01-13T07:40,K9,cold,,,,\n",
				observationsFile: obsHead + "2026-01-05T10:00,A9,K1,5,,,,\n2026-01-05T10:00,A1,K9,5,,,,\n",
				treatmentsFile:   treatHead + "C-1,A9,2026-01-06,wound,V1,,,\nC-2,A1,2026-01-06,wound,V9,,,\n",
			},
			want: []string{
				`deaths.csv:2: animal_id: "A9" is not in animals.csv: add a row for it to animals.csv, or correct the id`,
				`deaths.csv:3: found_by: "K9" is not in staff.csv: add a row for it to staff.csv, or correct the id`,
				`observations.csv:2: animal_id: "A9" is not in animals.csv: add a row for it to animals.csv, or correct the id`,
				`observations.csv:3: staff_id: "K9" is not in staff.csv: add a row for it to staff.csv, or correct the id`,
				`treatments.csv:2: animal_id: "A9" is not in animals.csv: add a row for it to animals.csv, or correct the id`,
				`treatments.csv:3: prescribed_by: "V9" is not in staff.csv: add a row for it to staff.csv, or correct the id`,
			},
		},
		{
			name: "dam unknown, male, or not present on whelped_on",
			over: map[string]string{littersFile: litterHead +
				"L-1,A9,2025-05-04,5,,,\n" +
				"L-2,A2,2025-05-04,5,,,\n" +
				"L-3,A1,2024-04-01,5,,,\n"},
			want: []string{
				`litters.csv:2: dam_id: "A9" is not in animals.csv: add a row for it to animals.csv, or correct the id`,
				`litters.csv:3: dam_id: "A2" is not a female (sex m at animals.csv:3)`,
				`litters.csv:4: dam_id: "A1" was not at the facility on whelped_on 2024-04-01 (arrived 2024-04-20, still here; animals.csv:2)`,
			},
		},
		{
			name: "a dam that left before whelping",
			over: map[string]string{
				animalsFile: "animal_id,species,sex,arrived_on,left_on,left_reason\nA1,vulpes_vulpes,f,2024-04-20,2025-03-01,sold\n",
				littersFile: litterHead + "L-1,A1,2025-05-04,5,,,\n",
			},
			want: []string{`litters.csv:2: dam_id: "A1" was not at the facility on whelped_on 2025-05-04 (arrived 2024-04-20, left 2025-03-01; animals.csv:2)`},
		},
		{
			name: "staff.csv missing",
			over: map[string]string{staffFile: "-", deathsFile: deathsHead + "A2,2026-01-13T07:40,K1,cold,,,,\n"},
			want: []string{
				`staff.csv: required file is missing: 1 row names a staff_id`,
				`deaths.csv:2: found_by: "K1" is not in staff.csv (staff.csv is missing): add staff.csv with a row for it`,
			},
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := mustLoad(t, folder(tt.over))
			if diff := cmp.Diff(tt.want, problemLines(s)); diff != "" {
				t.Errorf("problems (-want +got):\n%s", diff)
			}
		})
	}
}
