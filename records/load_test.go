package records

import (
	"errors"
	"io/fs"
	"math"
	"strings"
	"testing"
	"testing/fstest"
	"time"

	"github.com/google/go-cmp/cmp"
)

// The invented Birchfall Fur Research Station, small enough to read.
var baseFiles = map[string]string{
	"facility.yaml": `name: Birchfall Fur Research Station
time_zone: America/Winnipeg
buildings:
  - id: S1
    exposure: outdoor
    weather_site: MAST
  - id: B2
    exposure: indoor
weather_sites: [MAST]
`,
	"animals.csv": `animal_id,species,sex,born_on,arrived_on,enclosure_id,mass_kg,length_cm
A1,vulpes_vulpes,f,2024-04-20,2024-04-20,E1,6.2,68
A2,vulpes_lagopus,m,2024-05-02,2024-09-01,E2,4.1,55
`,
	"enclosures.csv": `enclosure_id,building_id,kind,length_cm,width_cm,floor_area_m2,height_cm,nest_box,platform
E1,S1,cage,120,100,,80,yes,yes
E2,B2,pen,,,4.5,100,y,n
`,
	"staff.csv": `staff_id,name,role,handling_trained_on,euthanasia_methods
K1,Ilse Marrow,keeper,2025-03-01,
V1,Tomas Fell,veterinarian,2025-01-10,barbiturate_overdose;captive_bolt
`,
}

var testSpecies = Options{Species: []string{"vulpes_vulpes", "vulpes_lagopus", "neogale_vison"}}

// folder is the base folder with some files replaced; "-" removes a file.
func folder(over map[string]string) fstest.MapFS {
	fsys := fstest.MapFS{}
	for name, data := range baseFiles {
		fsys[name] = &fstest.MapFile{Data: []byte(data)}
	}
	for name, data := range over {
		if data == "-" {
			delete(fsys, name)
			continue
		}
		fsys[name] = &fstest.MapFile{Data: []byte(data)}
	}
	return fsys
}

// mustLoad loads a folder and checks the invariants every load keeps:
// each file's rows are read = accepted + rejected, the accepted rows are
// the rows in the Set, and each rejected row has exactly one problem.
func mustLoad(t *testing.T, fsys fs.FS) *Set {
	t.Helper()
	s, err := Load(fsys, testSpecies)
	if err != nil {
		t.Fatalf("Load: %v", err)
	}
	lens := map[string]int{
		animalsFile: len(s.Animals), enclosuresFile: len(s.Enclosures), housingFile: len(s.Housing),
		staffFile: len(s.Staff), protocolsFile: len(s.Protocols), careFile: s.CareRounds().Len(),
		handlingFile: len(s.Handling), ppeFile: len(s.PPEChecks), weatherFile: len(s.Weather),
		workFile: len(s.Work), cullsFile: len(s.Culls),
		deathsFile: len(s.Deaths), observationsFile: len(s.Observations), treatmentsFile: len(s.Treatments),
		littersFile: len(s.Litters),
	}
	lens[environmentFile] = len(s.Environment)
	lens[correctiveFile] = len(s.CorrectiveActions)
	rowProblems := map[string]int{}
	for _, p := range s.Problems {
		if p.Line > 1 {
			rowProblems[p.File]++
		}
	}
	for _, c := range s.Accounting {
		if c.Read != c.Accepted+c.Rejected {
			t.Errorf("%s: read %d != accepted %d + rejected %d", c.File, c.Read, c.Accepted, c.Rejected)
		}
		if c.Accepted != lens[c.File] {
			t.Errorf("%s: accepted %d but the set holds %d rows", c.File, c.Accepted, lens[c.File])
		}
		if c.Failed == "" && rowProblems[c.File] != c.Rejected {
			t.Errorf("%s: %d rejected rows but %d row problems", c.File, c.Rejected, rowProblems[c.File])
		}
		if !s.Present[c.File] {
			t.Errorf("%s is accounted but not present", c.File)
		}
	}
	return s
}

func problemLines(s *Set) []string {
	out := []string{}
	for _, p := range s.Problems {
		out = append(out, p.Error())
	}
	return out
}

func TestLoadBase(t *testing.T) {
	s := mustLoad(t, folder(nil))
	if len(s.Problems) != 0 || len(s.Warnings) != 0 {
		t.Fatalf("problems %v, warnings %v", s.Problems, s.Warnings)
	}
	if s.Location.String() != "America/Winnipeg" || s.Facility.Name != "Birchfall Fur Research Station" {
		t.Errorf("facility = %+v in %v", s.Facility, s.Location)
	}
	if got, want := s.Facility.Buildings[1].Line, 7; got != want {
		t.Errorf("building B2 line = %d, want %d", got, want)
	}
	a := s.Animals[0]
	if a.Ref != "animals.csv:2" || a.ID != "A1" || a.Species != "vulpes_vulpes" || a.Sex != "f" ||
		a.BornOn != MakeDay(2024, 4, 20) || a.ArrivedOn != MakeDay(2024, 4, 20) || a.LeftOn != 0 ||
		*a.MassKg != 6.2 || *a.LengthCm != 68 || a.LifeStage != "" {
		t.Errorf("animal = %+v", a)
	}
	e := s.Enclosures
	// 120 cm × 100 cm = 1.2 m²; floor_area_m2 is used as given.
	if e[0].Area() != 1.2 || e[0].NestBox != Yes || e[0].Platform != Yes || e[1].Area() != 4.5 || e[1].Platform != No {
		t.Errorf("enclosures = %+v / %+v", e[0], e[1])
	}
	if d := cmp.Diff([]string{"barbiturate_overdose", "captive_bolt"}, s.Staff[1].EuthanasiaMethods); d != "" {
		t.Errorf("euthanasia methods (-want +got):\n%s", d)
	}
	want := []FileCount{{File: animalsFile, Read: 2, Accepted: 2}, {File: enclosuresFile, Read: 2, Accepted: 2}, {File: staffFile, Read: 2, Accepted: 2}}
	if d := cmp.Diff(want, s.Accounting); d != "" {
		t.Errorf("accounting (-want +got):\n%s", d)
	}
	if !s.Present[facilityFile] || !s.Present[animalsFile] || s.Present[careFile] {
		t.Errorf("present = %v", s.Present)
	}
}

// TestRowProblems: each bad row is rejected with one positioned, readable
// reason, and the rest of the file still loads.
func TestRowProblems(t *testing.T) {
	const careHead = "checked_at,enclosure_id,staff_id,observed,water\n"
	tests := []struct {
		name string
		over map[string]string
		want []string
	}{
		{
			name: "value not in the list",
			over: map[string]string{careFile: careHead + "2026-01-15T07:00,E1,K1,yes,frozn\n2026-01-15T16:00,E1,K1,yes,frozen\n"},
			want: []string{`daily_care.csv:2: water: "frozn" is not one of ok, low, empty, frozen, not_checked`},
		},
		{
			name: "species not in the limits",
			over: map[string]string{animalsFile: "animal_id,species,arrived_on\nA1,vulpes_zerda,2025-01-01\nA2,vulpes_vulpes,2025-01-01\n"},
			want: []string{`animals.csv:2: species: "vulpes_zerda" is not a species profile in the limits (neogale_vison, vulpes_lagopus, vulpes_vulpes)`},
		},
		{
			name: "required cell empty",
			over: map[string]string{animalsFile: "animal_id,species,arrived_on\nA1,vulpes_vulpes,\nA2,vulpes_vulpes,2025-01-01\n"},
			want: []string{`animals.csv:2: arrived_on: is required but empty`},
		},
		{
			name: "required boolean empty",
			over: map[string]string{careFile: careHead + "2026-01-15T07:00,E1,K1,,ok\n"},
			want: []string{`daily_care.csv:2: observed: is required but empty`},
		},
		{
			name: "impossible date",
			over: map[string]string{animalsFile: "animal_id,species,arrived_on,born_on\nA1,vulpes_vulpes,2025-01-01,2024-02-30\n"},
			want: []string{`animals.csv:2: born_on: "2024-02-30" is not a date (YYYY-MM-DD)`},
		},
		{
			name: "date-time in another form",
			over: map[string]string{careFile: careHead + "15/01/2026 07:00,E1,K1,yes,ok\n"},
			want: []string{`daily_care.csv:2: checked_at: "15/01/2026 07:00" is a day-first date: write 2026-01-15T07:00 (YYYY-MM-DDTHH:MM)`},
		},
		{
			name: "boolean not yes or no",
			over: map[string]string{enclosuresFile: "enclosure_id,building_id,kind,floor_area_m2,height_cm,nest_box\nE1,S1,cage,1.2,80,maybe\nE2,B2,pen,4.5,100,\n"},
			want: []string{`animals.csv:2: enclosure_id: "E1" is not in enclosures.csv (its row enclosures.csv:2 was rejected): fix that row first`, `enclosures.csv:2: nest_box: "maybe" is not yes or no (yes/no, y/n, true/false, 1/0)`},
		},
		{
			name: "decimal comma",
			over: map[string]string{animalsFile: "animal_id,species,arrived_on,mass_kg\nA1,vulpes_vulpes,2025-01-01,\"6,2\"\n"},
			want: []string{`animals.csv:2: mass_kg: "6,2" has a decimal comma: write 6.2 (numbers use a point)`},
		},
		{
			name: "whole number",
			over: map[string]string{enclosuresFile: "enclosure_id,building_id,kind,floor_area_m2,height_cm,max_occupants\nE1,S1,cage,1.2,80,1.5\nE2,B2,pen,4.5,100,0\n"},
			want: []string{
				`animals.csv:2: enclosure_id: "E1" is not in enclosures.csv (its row enclosures.csv:2 was rejected): fix that row first`,
				`animals.csv:3: enclosure_id: "E2" is not in enclosures.csv (its row enclosures.csv:3 was rejected): fix that row first`,
				`enclosures.csv:2: max_occupants: "1.5" is not a whole number`,
				`enclosures.csv:3: max_occupants: 0 must be at least 1`,
			},
		},
		{
			name: "id with a space",
			over: map[string]string{animalsFile: "animal_id,species,arrived_on\nA 1,vulpes_vulpes,2025-01-01\n"},
			want: []string{`animals.csv:2: animal_id: "A 1" is not an id (1 to 64 letters, digits or - _ . : /)`},
		},
		{
			name: "code not lower snake case",
			over: map[string]string{
				"culls.csv": "culled_at,animal_id,staff_id,reason,method\n2026-01-20T09:00,A1,V1,pelting,Captive-Bolt\n2026-01-20T09:30,A2,V1,pelting,captive_bolt\n",
				animalsFile: "animal_id,species,arrived_on,left_on,left_reason\nA1,vulpes_vulpes,2025-01-01,2026-01-20,culled\nA2,vulpes_vulpes,2025-01-01,2026-01-20,culled\n",
			},
			want: []string{`culls.csv:2: method: "Captive-Bolt" is not a lower_snake_case code`},
		},
		{
			name: "list element not allowed",
			over: map[string]string{"handling.csv": "handled_at,animal_id,staff_id,purpose,ppe\n2026-01-15T10:00,A1,K1,weighing,coverall;hat\n2026-01-15T10:00,A1,K1,weighing,coverall; boots\n"},
			want: []string{`handling.csv:2: ppe: "hat" is not one of coverall, gown, apron, face_shield, eye_protection, mask, respirator, boots`},
		},
		{
			name: "left_on without left_reason",
			over: map[string]string{animalsFile: "animal_id,species,arrived_on,left_on,left_reason\nA1,vulpes_vulpes,2025-01-01,2025-06-01,\nA2,vulpes_vulpes,2025-01-01,,died\nA3,vulpes_vulpes,2025-01-01,2024-12-31,sold\nA4,vulpes_vulpes,2025-01-01,2025-01-01,died\n"},
			want: []string{
				`animals.csv:2: left_reason: is required when left_on is given`,
				`animals.csv:3: left_on: is required when left_reason is given`,
				`animals.csv:4: left_on: 2024-12-31 is before arrived_on 2025-01-01`,
			},
		},
		{
			name: "enclosure without floor size",
			over: map[string]string{enclosuresFile: "enclosure_id,building_id,kind,length_cm,width_cm,height_cm\nE1,S1,cage,120,,80\nE2,B2,pen,200,300,100\n"},
			want: []string{`animals.csv:2: enclosure_id: "E1" is not in enclosures.csv (its row enclosures.csv:2 was rejected): fix that row first`, `enclosures.csv:2: floor_area_m2: is required when length_cm and width_cm are not both given`},
		},
		{
			name: "care round without time or place",
			over: map[string]string{careFile: "checked_at,date,enclosure_id,building_id,staff_id,observed\n,,E1,,K1,yes\n2026-01-15T07:00,,,,K1,yes\n2026-01-15T07:00,2026-01-16,E1,,K1,yes\n,2026-01-15,,S1,K1,no\n"},
			want: []string{
				`daily_care.csv:2: checked_at: is required but empty (give checked_at, or date)`,
				`daily_care.csv:3: enclosure_id: is required but empty (give enclosure_id, or building_id)`,
				`daily_care.csv:4: date: 2026-01-16 is not the day of checked_at (2026-01-15)`,
			},
		},
		{
			name: "row length",
			over: map[string]string{careFile: careHead + "2026-01-15T07:00,E1,K1,yes\n2026-01-15T07:00,E1,K1,yes,ok,extra\n2026-01-15T08:00,E1,K1,yes,ok\n"},
			want: []string{`daily_care.csv:2: row has 4 cells but the header has 5`, `daily_care.csv:3: row has 6 cells but the header has 5`},
		},
		{
			name: "blank row of commas",
			over: map[string]string{careFile: careHead + ",,,,\n2026-01-15T08:00,E1,K1,yes,ok\n"},
			want: []string{`daily_care.csv:2: row is empty (every cell is blank)`},
		},
		{
			name: "bare quote",
			over: map[string]string{careFile: "checked_at,enclosure_id,staff_id,observed,notes\n2026-01-15T07:00,E1,K1,yes,a 5\" gap\n2026-01-15T08:00,E1,K1,yes,ok\n"},
			want: []string{`daily_care.csv:2: bare " in non-quoted-field (line 2, character 31)`},
		},
		{
			name: "work ends before it starts",
			over: map[string]string{"outdoor_work.csv": "staff_id,started_at,ended_at,site_id\nK1,2026-01-15T09:00,2026-01-15T08:00,MAST\nK1,2026-01-15T09:00,2026-01-15T09:00,MAST\nK1,2026-01-15T09:00,2026-01-15T09:40,MAST\n"},
			want: []string{`outdoor_work.csv:2: ended_at: 2026-01-15T08:00 is not after started_at 2026-01-15T09:00`, `outdoor_work.csv:3: ended_at: 2026-01-15T09:00 is not after started_at 2026-01-15T09:00`},
		},
		{
			name: "protocol expires before approval",
			over: map[string]string{protocolsFile: "protocol_id,title,approved_on,expires_on\nP1,Winter housing,2025-06-01,2025-06-01\nP2,Temperament,2025-06-01,2028-05-31\n"},
			want: []string{`protocols.csv:2: expires_on: 2025-06-01 is not after approved_on 2025-06-01`},
		},
		{
			name: "housing moves out before moving in",
			over: map[string]string{housingFile: "animal_id,enclosure_id,moved_in_on,moved_out_on\nA1,E1,2025-03-01,2025-02-01\n"},
			want: []string{`housing.csv:2: moved_out_on: 2025-02-01 is not after moved_in_on 2025-03-01`},
		},
		{
			name: "protocol max animals and list of codes",
			over: map[string]string{protocolsFile: "protocol_id,title,approved_on,expires_on,max_animals,species,procedures\nP1,Winter housing,2025-06-01,2028-06-01,-1,vulpes_vulpes,\nP2,Temperament,2025-06-01,2028-05-31,40,Vulpes;vulpes_lagopus,\nP3,Care,2025-06-01,2028-05-31,40,,weighing;dancing\n"},
			want: []string{
				`protocols.csv:2: max_animals: -1 must be at least 0`,
				`protocols.csv:3: species: "Vulpes" is not a lower_snake_case code`,
				`protocols.csv:4: procedures: "dancing" is not one of temperament_test, health_check, vet_exam, treatment, weighing, transfer, breeding, sampling, other`,
			},
		},
		{
			name: "titer range",
			over: map[string]string{staffFile: "staff_id,name,role,rabies_titer_iu_ml\nK1,Ilse Marrow,keeper,5000\nV1,Tomas Fell,veterinarian,0.5\n"},
			want: []string{`staff.csv:2: rabies_titer_iu_ml: 5000 is outside the plausible range 0 … 1000`},
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := mustLoad(t, folder(tt.over))
			if d := cmp.Diff(tt.want, problemLines(s)); d != "" {
				t.Errorf("problems (-want +got):\n%s", d)
			}
		})
	}
}

// TestColdPlausibility: readings a cold-climate facility really records
// load; values that can only be typing errors are rejected.
func TestColdPlausibility(t *testing.T) {
	over := map[string]string{
		"weather.csv": "observed_at,site_id,air_temp_c,wind_kmh\n" +
			"2026-01-15T07:00,MAST,-40,20\n" + // −40 °C: a real prairie cold snap (common practice)
			"2026-01-15T08:00,MAST,-90,20\n" + // below the −80 °C floor of records.md: a typing error
			"2026-01-15T09:00,MAST,61,20\n" +
			"2026-01-15T10:00,MAST,-5,260\n",
		"handling.csv": "handled_at,animal_id,staff_id,purpose,glove,glove_thickness_mm\n" +
			"2026-01-15T10:00,A1,K1,weighing,gauntlet,50\n" + // 50 mm: thick leather gauntlet with liner (common practice)
			"2026-01-15T11:00,A1,K1,weighing,gauntlet,0\n" +
			"2026-01-15T12:00,A1,K1,weighing,gauntlet,150\n",
		animalsFile: "animal_id,species,arrived_on,mass_kg,length_cm\n" +
			"A1,vulpes_vulpes,2025-01-01,6.2,68\n" +
			"A2,vulpes_vulpes,2025-01-01,0,60\n" +
			"A3,vulpes_vulpes,2025-01-01,250,60\n",
		enclosuresFile: "enclosure_id,building_id,kind,floor_area_m2,height_cm\n" +
			"E1,S1,cage,1.2,80\n" +
			"E2,S1,cage,1.2,0\n" +
			"E3,S1,pen,12000,100\n",
	}
	s := mustLoad(t, folder(over))
	want := []string{
		`animals.csv:3: mass_kg: 0 kg is outside the plausible range > 0 … 200 kg`,
		`animals.csv:4: mass_kg: 250 kg is outside the plausible range > 0 … 200 kg`,
		`enclosures.csv:3: height_cm: 0 cm is outside the plausible range > 0 … 5000 cm`,
		`enclosures.csv:4: floor_area_m2: 12000 m² is outside the plausible range > 0 … 10000 m²`,
		`handling.csv:3: glove_thickness_mm: 0 mm is outside the plausible range > 0 … 100 mm`,
		`handling.csv:4: glove_thickness_mm: 150 mm is outside the plausible range > 0 … 100 mm`,
		`weather.csv:3: air_temp_c: -90 °C is outside the plausible range -80 … 60 °C`,
		`weather.csv:4: air_temp_c: 61 °C is outside the plausible range -80 … 60 °C`,
		`weather.csv:5: wind_kmh: 260 km/h is outside the plausible range 0 … 250 km/h`,
	}
	if d := cmp.Diff(want, problemLines(s)); d != "" {
		t.Errorf("problems (-want +got):\n%s", d)
	}
	if len(s.Weather) != 1 || s.Weather[0].AirTempC != -40 {
		t.Errorf("weather = %+v, want the −40 °C reading", s.Weather)
	}
	if len(s.Handling) != 1 || *s.Handling[0].GloveThicknessMm != 50 {
		t.Errorf("handling = %+v, want the 50 mm glove", s.Handling)
	}
	if p := s.Problems[6]; p.Day != MakeDay(2026, 1, 15) || p.Value != "-90" || p.Column != "air_temp_c" {
		t.Errorf("rejected reading = %+v, want its day, value and column", p)
	}
}

// TestUnitColumns: each unit alternative loads and is converted to the SI
// unit of the field; the values are NIST SP 811 Appendix B.8 conversions.
func TestUnitColumns(t *testing.T) {
	over := map[string]string{
		"weather.csv": "observed_at,site_id,air_temp_f,wind_mph\n" +
			"2026-01-15T07:00,MAST,-40,15\n" + // −40 °F = −40 °C; 15 mph = 24.14016 km/h (SP 811 B.8)
			"2026-01-15T08:00,MAST,-130,0\n", // −130 °F = −90 °C: rejected, reported in both units
		"handling.csv": "handled_at,animal_id,staff_id,purpose,duration_min\n2026-01-15T10:00,A1,K1,weighing,12.5\n",
		animalsFile:    "animal_id,species,arrived_on,mass_lb,length_in\nA1,vulpes_vulpes,2025-01-01,22,24\n", // 22 lb = 9.97903214 kg; 24 in = 60.96 cm (SP 811 B.8)
		enclosuresFile: "enclosure_id,building_id,kind,floor_area_ft2,height_in\nE1,S1,cage,10,36\n",          // 10 ft² = 0.9290304 m²; 36 in = 91.44 cm (SP 811 B.8)
		careFile:       "checked_at,enclosure_id,staff_id,observed,feed_g\n2026-01-15T07:00,E1,K1,yes,250\n",
	}
	s := mustLoad(t, folder(over))
	want := []string{`weather.csv:3: air_temp_f: -130 °F (-90.0 °C) is outside the plausible range -80 … 60 °C`}
	if d := cmp.Diff(want, problemLines(s)); d != "" {
		t.Errorf("problems (-want +got):\n%s", d)
	}
	near := func(name string, got, want float64) {
		t.Helper()
		if math.Abs(got-want) > 1e-9 {
			t.Errorf("%s = %v, want %v", name, got, want)
		}
	}
	near("air °C", s.Weather[0].AirTempC, -40)
	near("wind km/h", *s.Weather[0].WindKmh, 24.14016)
	near("mass kg", *s.Animals[0].MassKg, 9.97903214)
	near("length cm", *s.Animals[0].LengthCm, 60.96)
	near("floor m²", *s.Enclosures[0].FloorAreaM2, 0.9290304)
	near("height cm", s.Enclosures[0].HeightCm, 91.44)
	near("duration min", *s.Handling[0].DurationMin, 12.5)
	near("feed g", *s.CareRounds().Round(0).FeedG, 250)

	s = mustLoad(t, folder(map[string]string{"weather.csv": "observed_at,site_id,air_temp_c,wind_ms\n2026-01-15T07:00,MAST,-20,10\n"}))
	near("wind km/h from m/s", *s.Weather[0].WindKmh, 36) // 10 m/s × 3.6 = 36 km/h (SP 811 B.8)
}

func TestCSVForms(t *testing.T) {
	tests := []struct {
		name    string
		animals string
		check   func(t *testing.T, s *Set)
	}{
		{
			name:    "byte-order mark",
			animals: "\ufeffanimal_id,species,arrived_on\nA1,vulpes_vulpes,2025-01-01\n",
			check: func(t *testing.T, s *Set) {
				if len(s.Animals) != 1 || s.Animals[0].ID != "A1" {
					t.Errorf("animals = %+v", s.Animals)
				}
			},
		},
		{
			name:    "CRLF line ends",
			animals: "animal_id,species,arrived_on\r\nA1,vulpes_vulpes,2025-01-01\r\nA2,vulpes_lagopus,2025-01-02\r\n",
			check: func(t *testing.T, s *Set) {
				if len(s.Animals) != 2 || s.Animals[1].ArrivedOn != MakeDay(2025, 1, 2) || s.Animals[1].Ref != "animals.csv:3" {
					t.Errorf("animals = %+v", s.Animals)
				}
			},
		},
		{
			name:    "header in any order, case and spacing",
			animals: " Arrived_On , SPECIES,animal_id\n2025-01-01,vulpes_vulpes,A1\n",
			check: func(t *testing.T, s *Set) {
				if len(s.Animals) != 1 || s.Animals[0].Species != "vulpes_vulpes" || s.Animals[0].ArrivedOn != MakeDay(2025, 1, 1) {
					t.Errorf("animals = %+v", s.Animals)
				}
			},
		},
		{
			name:    "quoted comma and embedded newline",
			animals: "animal_id,species,arrived_on,life_stage\nA1,vulpes_vulpes,2025-01-01,\n\"A2\",\"vulpes_vulpes\",\"2025-01-01\",\"adult\"\n",
			check: func(t *testing.T, s *Set) {
				if len(s.Animals) != 2 || s.Animals[1].LifeStage != "adult" || s.Animals[0].LifeStage != "" {
					t.Errorf("animals = %+v", s.Animals)
				}
			},
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := mustLoad(t, folder(map[string]string{animalsFile: tt.animals}))
			if len(s.Problems) != 0 {
				t.Fatalf("problems: %v", s.Problems)
			}
			tt.check(t, s)
		})
	}

	// Notes may hold commas and line breaks; the row's reference is the line
	// its record starts on, and the next record's line counts the break.
	s := mustLoad(t, folder(map[string]string{careFile: "checked_at,enclosure_id,staff_id,observed,notes\n" +
		"2026-01-15T07:00,E1,K1,yes,\"ice in bowl, broken\nand refilled\"\n" +
		"2026-01-15T16:00,E1,K1,yes,\"said \"\"fine\"\"\"\n"}))
	care := s.CareRounds().Rounds()
	if len(care) != 2 || care[0].Notes != "ice in bowl, broken\nand refilled" || care[0].Ref != "daily_care.csv:2" ||
		care[1].Ref != "daily_care.csv:4" || care[1].Notes != `said "fine"` {
		t.Errorf("care = %+v, problems %v", care, s.Problems)
	}
}

func TestFileLevel(t *testing.T) {
	tests := []struct {
		name     string
		over     map[string]string
		want     []string
		count    FileCount
		warnings []string
	}{
		{
			name:  "empty file",
			over:  map[string]string{careFile: ""},
			want:  []string{`daily_care.csv: no header row (the file is empty)`},
			count: FileCount{File: careFile, Failed: "no header row (the file is empty)"},
		},
		{
			name:  "header only",
			over:  map[string]string{careFile: "checked_at,enclosure_id,staff_id,observed\n"},
			want:  []string{},
			count: FileCount{File: careFile},
		},
		{
			name:  "duplicate column",
			over:  map[string]string{careFile: "checked_at,enclosure_id,staff_id,observed,Staff_ID\n2026-01-15T07:00,E1,K1,yes,K1\n2026-01-15T08:00,E1,K1,yes,K1\n"},
			want:  []string{`daily_care.csv:1: Staff_ID: column appears twice (columns 3 and 5); its 2 rows are not read`},
			count: FileCount{File: careFile, Read: 2, Rejected: 2, Failed: "Staff_ID: column appears twice (columns 3 and 5)"},
		},
		{
			name:  "two units for one measurement",
			over:  map[string]string{"weather.csv": "observed_at,site_id,air_temp_c,air_temp_f\n2026-01-15T07:00,MAST,-40,-40\n"},
			want:  []string{`weather.csv:1: air_temp_f: two units for one measurement: air_temp_c and air_temp_f; keep one; its 1 row is not read`},
			count: FileCount{File: weatherFile, Read: 1, Rejected: 1, Failed: "air_temp_f: two units for one measurement: air_temp_c and air_temp_f; keep one"},
		},
		{
			name:  "missing required column",
			over:  map[string]string{"handling.csv": "handled_at,animal_id,purpose\n2026-01-15T10:00,A1,weighing\n2026-01-15T11:00,A1,weighing\n2026-01-15T12:00,A1,weighing\n"},
			want:  []string{`handling.csv:1: staff_id: required column is missing; its 3 rows are not read`},
			count: FileCount{File: handlingFile, Read: 3, Rejected: 3, Failed: "staff_id: required column is missing"},
		},
		{
			name:  "missing measured column",
			over:  map[string]string{"weather.csv": "observed_at,site_id,wind_kmh\n2026-01-15T07:00,MAST,20\n"},
			want:  []string{`weather.csv:1: air_temp_c: required column is missing (give one of air_temp_c or air_temp_f); its 1 row is not read`},
			count: FileCount{File: weatherFile, Read: 1, Rejected: 1, Failed: "air_temp_c: required column is missing (give one of air_temp_c or air_temp_f)"},
		},
		{
			name:  "care without time columns",
			over:  map[string]string{careFile: "enclosure_id,staff_id,observed\nE1,K1,yes\n"},
			want:  []string{`daily_care.csv:1: checked_at: required column is missing (give checked_at, or date); its 1 row is not read`},
			count: FileCount{File: careFile, Read: 1, Rejected: 1, Failed: "checked_at: required column is missing (give checked_at, or date)"},
		},
		{
			name:     "unknown column",
			over:     map[string]string{careFile: "checked_at,enclosure_id,staff_id,observed,mood,\n2026-01-15T07:00,E1,K1,yes,calm,\n"},
			want:     []string{},
			count:    FileCount{File: careFile, Read: 1, Accepted: 1},
			warnings: []string{"daily_care.csv: mood: unknown column, not read", "daily_care.csv: column 6 has no name: unknown column, not read"},
		},
		{
			name:     "unknown files",
			over:     map[string]string{"notes.txt": "x", "Weather.csv": "observed_at\n", "old/animals.csv": "x"},
			want:     []string{},
			count:    FileCount{File: animalsFile, Read: 2, Accepted: 2},
			warnings: []string{"Weather.csv: unknown file, not read (file names are lower case: did you mean weather.csv?)", "notes.txt: unknown file, not read", "old: unknown folder, not read"},
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := mustLoad(t, folder(tt.over))
			if d := cmp.Diff(tt.want, problemLines(s)); d != "" {
				t.Errorf("problems (-want +got):\n%s", d)
			}
			got, ok := s.Count(tt.count.File)
			if !ok {
				t.Errorf("%s not accounted", tt.count.File)
			}
			if d := cmp.Diff(tt.count, got); d != "" {
				t.Errorf("accounting (-want +got):\n%s", d)
			}
			if got.Failed != "" && !strings.HasSuffix(got.String(), "(file not used: "+got.Failed+")") {
				t.Errorf("accounting line = %q, want the failure named", got.String())
			}
			warnings := []string{}
			for _, w := range s.Warnings {
				warnings = append(warnings, w.String())
			}
			if tt.warnings == nil {
				tt.warnings = []string{}
			}
			if d := cmp.Diff(tt.warnings, warnings); d != "" {
				t.Errorf("warnings (-want +got):\n%s", d)
			}
		})
	}
}

func TestCrossRecord(t *testing.T) {
	const (
		careHead = "checked_at,enclosure_id,building_id,staff_id,observed,health_concern,concern_animal_id\n"
		handHead = "handled_at,animal_id,staff_id,purpose,glove,glove_id,protocol_id\n"
	)
	tests := []struct {
		name string
		over map[string]string
		want []string
	}{
		{
			name: "enclosure in an unknown building, and the animal in it",
			over: map[string]string{enclosuresFile: "enclosure_id,building_id,kind,floor_area_m2,height_cm\nE1,S9,cage,1.2,80\nE2,B2,pen,4.5,100\n"},
			want: []string{
				`animals.csv:2: enclosure_id: "E1" is not in enclosures.csv (its row enclosures.csv:2 was rejected): fix that row first`,
				`enclosures.csv:2: building_id: "S9" is not a building: add it under buildings in facility.yaml`,
			},
		},
		{
			name: "duplicate ids: the first wins",
			over: map[string]string{
				animalsFile:    "animal_id,species,arrived_on\nA1,vulpes_vulpes,2025-01-01\nA2,vulpes_vulpes,2025-01-01\nA1,vulpes_lagopus,2025-02-01\n",
				enclosuresFile: "enclosure_id,building_id,kind,floor_area_m2,height_cm\nE1,S1,cage,1.2,80\nE1,S1,cage,1.5,80\n",
				staffFile:      "staff_id,name,role\nK1,Ilse Marrow,keeper\nK1,Ilse Marrow,supervisor\n",
				protocolsFile:  "protocol_id,title,approved_on,expires_on\nP1,Winter housing,2025-06-01,2028-06-01\nP1,Winter housing,2025-06-01,2028-06-01\n",
			},
			want: []string{
				`animals.csv:4: animal_id: "A1" is a duplicate; first at animals.csv:2`,
				`enclosures.csv:3: enclosure_id: "E1" is a duplicate; first at enclosures.csv:2`,
				`staff.csv:3: staff_id: "K1" is a duplicate; first at staff.csv:2`,
				`protocols.csv:3: protocol_id: "P1" is a duplicate; first at protocols.csv:2`,
			},
		},
		{
			name: "animal's protocol unknown",
			over: map[string]string{
				animalsFile:   "animal_id,species,arrived_on,protocol_id\nA1,vulpes_vulpes,2025-01-01,P1\nA2,vulpes_vulpes,2025-01-01,P2\n",
				protocolsFile: "protocol_id,title,approved_on,expires_on\nP1,Winter housing,2025-06-01,2028-06-01\n",
			},
			want: []string{`animals.csv:3: protocol_id: "P2" is not in protocols.csv: add a row for it to protocols.csv, or correct the id`},
		},
		{
			name: "housing: unknown animal and enclosure, overlapping stays",
			over: map[string]string{housingFile: "animal_id,enclosure_id,moved_in_on,moved_out_on\n" +
				"A1,E1,2025-01-01,2025-03-01\n" +
				"A1,E2,2025-03-01,\n" + // moves out and in the same day: no overlap
				"A1,E1,2025-06-01,2025-07-01\n" + // A1 is still in E2 then
				"A2,E2,2025-01-01,2025-02-01\n" +
				"A2,E1,2025-01-15,\n" +
				"A9,E1,2025-01-01,\n" +
				"A2,E7,2025-05-01,\n"},
			want: []string{
				`housing.csv:4: moved_in_on: stay 2025-06-01 … 2025-07-01 overlaps the stay 2025-03-01 … still there at housing.csv:3`,
				`housing.csv:6: moved_in_on: stay 2025-01-15 … still there overlaps the stay 2025-01-01 … 2025-02-01 at housing.csv:5`,
				`housing.csv:7: animal_id: "A9" is not in animals.csv: add a row for it to animals.csv, or correct the id`,
				`housing.csv:8: enclosure_id: "E7" is not in enclosures.csv: add a row for it to enclosures.csv, or correct the id`,
			},
		},
		{
			// A rejected row before them shifts the kept rows; the overlap
			// check must still compare against the right earlier stay.
			name: "housing overlap after a rejected row",
			over: map[string]string{housingFile: "animal_id,enclosure_id,moved_in_on,moved_out_on\n" +
				"A9,E1,2025-01-01,\n" +
				"A1,E1,2025-01-01,2025-03-01\n" +
				"A2,E2,2026-01-01,2026-02-01\n" +
				"A1,E2,2025-02-01,2025-02-15\n"},
			want: []string{
				`housing.csv:2: animal_id: "A9" is not in animals.csv: add a row for it to animals.csv, or correct the id`,
				`housing.csv:5: moved_in_on: stay 2025-02-01 … 2025-02-15 overlaps the stay 2025-01-01 … 2025-03-01 at housing.csv:3`,
			},
		},
		{
			name: "care round references",
			over: map[string]string{careFile: careHead +
				"2026-01-15T07:00,E1,,K1,yes,no,\n" +
				"2026-01-15T07:00,,S1,K1,yes,no,\n" +
				"2026-01-15T07:00,,S7,K1,yes,no,\n" +
				"2026-01-15T07:00,E9,,K1,yes,no,\n" +
				"2026-01-15T07:00,E1,,K7,yes,no,\n" +
				"2026-01-15T07:00,E1,,K1,yes,yes,A7\n"},
			want: []string{
				`daily_care.csv:4: building_id: "S7" is not a building: add it under buildings in facility.yaml`,
				`daily_care.csv:5: enclosure_id: "E9" is not in enclosures.csv: add a row for it to enclosures.csv, or correct the id`,
				`daily_care.csv:6: staff_id: "K7" is not in staff.csv: add a row for it to staff.csv, or correct the id`,
				`daily_care.csv:7: concern_animal_id: "A7" is not in animals.csv: add a row for it to animals.csv, or correct the id`,
			},
		},
		{
			name: "handling: glove must be a checked PPE item when ppe_checks.csv exists",
			over: map[string]string{
				"handling.csv":   handHead + "2026-01-15T10:00,A1,K1,weighing,gauntlet,G1,\n2026-01-15T11:00,A1,K1,weighing,gauntlet,G2,\n2026-01-15T12:00,A3,K1,weighing,gauntlet,G1,\n",
				"ppe_checks.csv": "checked_on,item_id,item,condition,assigned_to\n2026-01-02,G1,gauntlet,good,K1\n2026-01-02,G3,gauntlet,worn,K5\n",
			},
			want: []string{
				`handling.csv:3: glove_id: "G2" is not an item_id in ppe_checks.csv: add an inspection of it to ppe_checks.csv, or correct the id`,
				`handling.csv:4: animal_id: "A3" is not in animals.csv: add a row for it to animals.csv, or correct the id`,
				`ppe_checks.csv:3: assigned_to: "K5" is not in staff.csv: add a row for it to staff.csv, or correct the id`,
			},
		},
		{
			name: "handling: glove id not checked when there is no ppe_checks.csv",
			over: map[string]string{"handling.csv": handHead + "2026-01-15T10:00,A1,K1,weighing,gauntlet,G2,P1\n"},
			want: []string{},
		},
		{
			name: "weather site and outdoor work",
			over: map[string]string{
				"weather.csv":      "observed_at,site_id,air_temp_c\n2026-01-15T07:00,MAST,-31\n2026-01-15T07:00,ROOF,-30\n",
				"outdoor_work.csv": "staff_id,started_at,ended_at,site_id\nK1,2026-01-15T07:00,2026-01-15T07:40,ROOF\nK9,2026-01-15T07:00,2026-01-15T07:40,MAST\n",
			},
			want: []string{
				`weather.csv:3: site_id: "ROOF" is not a weather site: add it under weather_sites in facility.yaml`,
				`outdoor_work.csv:2: site_id: "ROOF" is not a weather site: add it under weather_sites in facility.yaml`,
				`outdoor_work.csv:3: staff_id: "K9" is not in staff.csv: add a row for it to staff.csv, or correct the id`,
			},
		},
		{
			name: "culls: unknown animal, staff and protocol",
			over: map[string]string{
				protocolsFile: "protocol_id,title,approved_on,expires_on\nP1,Winter housing,2025-06-01,2028-06-01\n",
				"culls.csv": "culled_at,animal_id,staff_id,reason,method,protocol_id\n" +
					"2026-01-20T09:00,A1,V1,pelting,captive_bolt,P1\n" +
					"2026-01-20T09:00,A8,V1,pelting,captive_bolt,P1\n" +
					"2026-01-20T09:00,A2,V8,pelting,captive_bolt,P1\n" +
					"2026-01-20T09:00,A2,V1,pelting,captive_bolt,P8\n",
			},
			want: []string{
				`culls.csv:3: animal_id: "A8" is not in animals.csv: add a row for it to animals.csv, or correct the id`,
				`culls.csv:4: staff_id: "V8" is not in staff.csv: add a row for it to staff.csv, or correct the id`,
				`culls.csv:5: protocol_id: "P8" is not in protocols.csv: add a row for it to protocols.csv, or correct the id`,
			},
		},
		{
			// The second id of protocols.csv:3's list is unknown: the
			// protocol is rejected, and so is the animal under it.
			name: "protocol personnel unknown",
			over: map[string]string{
				protocolsFile: "protocol_id,title,approved_on,expires_on,personnel\n" +
					"P1,Winter housing,2025-06-01,2028-06-01,K1;V1\n" +
					"P2,Coat study,2025-06-01,2028-06-01,K1;ZZ9\n" +
					"P3,Nest use,2025-06-01,2028-06-01,\n",
				animalsFile: "animal_id,species,arrived_on,protocol_id\nA1,vulpes_vulpes,2025-01-01,P1\nA2,vulpes_vulpes,2025-01-01,P2\n",
			},
			want: []string{
				`animals.csv:3: protocol_id: "P2" is not in protocols.csv (its row protocols.csv:3 was rejected): fix that row first`,
				`protocols.csv:3: personnel: "ZZ9" is not in staff.csv: add a row for it to staff.csv, or correct the id`,
			},
		},
		{
			name: "staff.csv missing while a protocol names personnel",
			over: map[string]string{
				staffFile:     "-",
				protocolsFile: "protocol_id,title,approved_on,expires_on,personnel\nP1,Winter housing,2025-06-01,2028-06-01,K1\n",
			},
			want: []string{
				`staff.csv: required file is missing: 1 row names a staff_id`,
				`protocols.csv:2: personnel: "K1" is not in staff.csv (staff.csv is missing): add staff.csv with a row for it`,
			},
		},
		{
			name: "staff.csv missing while rows name staff",
			over: map[string]string{
				staffFile: "-",
				careFile:  careHead + "2026-01-15T07:00,E1,,K1,yes,no,\n2026-01-15T16:00,E1,,K1,yes,no,\n",
			},
			want: []string{
				`staff.csv: required file is missing: 2 rows name a staff_id`,
				`daily_care.csv:2: staff_id: "K1" is not in staff.csv (staff.csv is missing): add staff.csv with a row for it`,
				`daily_care.csv:3: staff_id: "K1" is not in staff.csv (staff.csv is missing): add staff.csv with a row for it`,
			},
		},
		{
			name: "staff.csv may be absent when nobody is named",
			over: map[string]string{staffFile: "-"},
			want: []string{},
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s := mustLoad(t, folder(tt.over))
			if d := cmp.Diff(tt.want, problemLines(s)); d != "" {
				t.Errorf("problems (-want +got):\n%s", d)
			}
		})
	}
}

func TestCareRoundTimes(t *testing.T) {
	s := mustLoad(t, folder(map[string]string{careFile: "checked_at,date,enclosure_id,staff_id,observed\n" +
		"2026-01-15T07:30,,E1,K1,yes\n" +
		",2026-01-16,E1,K1,no\n" +
		"2026-01-17T03:00:00Z,,E1,K1,yes\n"})) // 21:00 on Jan 16 in Winnipeg (UTC−6)
	care := s.CareRounds().Rounds()
	if len(care) != 3 {
		t.Fatalf("care = %+v, problems %v", care, s.Problems)
	}
	loc := s.Location
	tests := []struct {
		got      CareRound
		at       time.Time
		day      Day
		dateOnly bool
	}{
		{care[0], time.Date(2026, 1, 15, 7, 30, 0, 0, loc), MakeDay(2026, 1, 15), false},
		{care[1], time.Date(2026, 1, 16, 0, 0, 0, 0, loc), MakeDay(2026, 1, 16), true},
		{care[2], time.Date(2026, 1, 16, 21, 0, 0, 0, loc), MakeDay(2026, 1, 16), false},
	}
	for _, tt := range tests {
		t.Run(string(tt.got.Ref), func(t *testing.T) {
			if !tt.got.At.Equal(tt.at) || tt.got.Day != tt.day || tt.got.DateOnly != tt.dateOnly {
				t.Errorf("round = at %v day %v date-only %v; want %v %v %v", tt.got.At, tt.got.Day, tt.got.DateOnly, tt.at, tt.day, tt.dateOnly)
			}
			if tt.got.Observed == NotRecorded {
				t.Errorf("observed not read")
			}
		})
	}
	if care[1].Observed != No {
		t.Errorf("observed = %v, want no", care[1].Observed)
	}
}

func TestSpeciesNotChecked(t *testing.T) {
	s, err := Load(folder(nil), Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Warnings) != 1 || s.Warnings[0].String() != "animals.csv: species: not checked against species profiles (no limits were given)" {
		t.Errorf("warnings = %v", s.Warnings)
	}
}

func TestLoadErrors(t *testing.T) {
	fac := func(body string) map[string]string { return map[string]string{facilityFile: body} }
	tests := []struct {
		name     string
		over     map[string]string
		want     string
		notExist bool
	}{
		{"facility missing", fac("-"), "facility.yaml: required file is missing", true},
		{"animals missing", map[string]string{animalsFile: "-"}, "animals.csv: required file is missing", true},
		{"enclosures missing", map[string]string{enclosuresFile: "-"}, "enclosures.csv: required file is missing", true},
		{"facility empty", fac(""), "facility.yaml: is empty", false},
		{"unknown key", fac("name: X\ntime_zone: UTC\ncolour: red\nbuildings:\n  - id: S1\n    exposure: outdoor\n"), "facility.yaml:3: colour: unknown key (the keys here are name, time_zone, buildings, weather_sites)", false},
		{"bad time zone", fac("name: X\ntime_zone: Mars/Olympus\nbuildings:\n  - id: S1\n    exposure: outdoor\n"),
			`facility.yaml:2: time_zone: "Mars/Olympus" is not an IANA time zone name (such as America/Winnipeg)`, false},
		{"syntax", fac("name: X\n  time_zone: [UTC\n"), "facility.yaml:2: mapping values are not allowed in this context", false},
		{"bad exposure", fac("name: X\ntime_zone: UTC\nbuildings:\n  - id: S1\n    exposure: outside\n"),
			`facility.yaml:5: buildings[0].exposure: "outside" is not one of outdoor, sheltered, indoor`, false},
		{"no buildings", fac("name: X\ntime_zone: UTC\n"), "facility.yaml: buildings: is required", false},
		{"bad weather site", fac("name: X\ntime_zone: UTC\nbuildings:\n  - id: S1\n    exposure: outdoor\n    weather_site: ROOF\nweather_sites: [MAST]\n"),
			`facility.yaml:6: buildings[0].weather_site: "ROOF" is not one of the weather_sites: add it under weather_sites`, false},
		{"duplicate building", fac("name: X\ntime_zone: UTC\nbuildings:\n  - id: S1\n    exposure: outdoor\n  - id: S1\n    exposure: indoor\n"),
			`facility.yaml:6: buildings[1].id: "S1" is a duplicate; first at facility.yaml:4`, false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			s, err := Load(folder(tt.over), testSpecies)
			var le *LoadError
			if !errors.As(err, &le) {
				t.Fatalf("Load = %v, %v; want a *LoadError", s, err)
			}
			if got := err.Error(); got != tt.want {
				t.Errorf("error = %q, want %q", got, tt.want)
			}
			if got := errors.Is(err, fs.ErrNotExist); got != tt.notExist {
				t.Errorf("errors.Is(err, fs.ErrNotExist) = %v, want %v", got, tt.notExist)
			}
		})
	}
}

func TestProblemDayAndValue(t *testing.T) {
	s := mustLoad(t, folder(map[string]string{careFile: "checked_at,enclosure_id,staff_id,observed,water\n2026-01-15T07:00,E1,K1,yes, frozn \n"}))
	want := Problem{File: careFile, Line: 2, Column: "water", Value: " frozn ", Reason: `"frozn" is not one of ok, low, empty, frozen, not_checked`, Day: MakeDay(2026, 1, 15)}
	if d := cmp.Diff([]Problem{want}, s.Problems); d != "" {
		t.Errorf("problems (-want +got):\n%s", d)
	}
}
