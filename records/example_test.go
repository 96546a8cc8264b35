package records_test

import (
	"fmt"
	"testing/fstest"

	"welfare/records"
)

func ExampleLoad() {
	// An invented station's records: one cold morning, one typing error.
	folder := fstest.MapFS{
		"facility.yaml": {Data: []byte(`name: Birchfall Fur Research Station
time_zone: America/Winnipeg
buildings:
  - id: S1
    exposure: outdoor
    weather_site: MAST
weather_sites: [MAST]
`)},
		"animals.csv":    {Data: []byte("animal_id,species,arrived_on,enclosure_id,mass_kg\nA1,vulpes_vulpes,2024-04-20,E1,6.2\n")},
		"enclosures.csv": {Data: []byte("enclosure_id,building_id,kind,length_cm,width_cm,height_cm\nE1,S1,cage,120,100,80\n")},
		"staff.csv":      {Data: []byte("staff_id,name,role\nK1,Ilse Marrow,keeper\n")},
		"weather.csv":    {Data: []byte("observed_at,site_id,air_temp_f,wind_mph\n2026-01-15T07:00,MAST,-40,15\n2026-01-15T08:00,MAST,-130,15\n")},
		"daily_care.csv": {Data: []byte("checked_at,enclosure_id,staff_id,observed,water\n2026-01-15T07:30,E1,K1,yes,frozen\n2026-01-15T16:00,E1,K1,yes,frozn\n")},
	}
	set, err := records.Load(folder, records.Options{Species: []string{"vulpes_vulpes", "vulpes_lagopus"}})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, c := range set.Accounting {
		fmt.Printf("%-15s read %d, accepted %d, rejected %d\n", c.File, c.Read, c.Accepted, c.Rejected)
	}
	for _, p := range set.Problems {
		fmt.Println(p)
	}
	w := set.Weather[0]
	// −40 °F is −40 °C and 15 mph is 24.1 km/h (NIST SP 811, Appendix B.8).
	fmt.Printf("%s: %.1f °C, wind %.1f km/h\n", w.Ref, w.AirTempC, *w.WindKmh)
	// Output:
	// animals.csv     read 1, accepted 1, rejected 0
	// enclosures.csv  read 1, accepted 1, rejected 0
	// staff.csv       read 1, accepted 1, rejected 0
	// daily_care.csv  read 2, accepted 1, rejected 1
	// weather.csv     read 2, accepted 1, rejected 1
	// daily_care.csv:3: water: "frozn" is not one of ok, low, empty, frozen, not_checked
	// weather.csv:3: air_temp_f: -130 °F (-90.0 °C) is outside the plausible range -80 … 60 °C
	// weather.csv:2: -40.0 °C, wind 24.1 km/h
}
