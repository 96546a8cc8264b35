package records

import (
	"bytes"
	"fmt"
	"sync"
	"testing"
	"testing/fstest"
	"time"
)

// healthBenchFolder builds, once, a valid folder of 1,000 animals with
// n rows in each of the health files.
var healthBenchFolder = sync.OnceValue(func() fstest.MapFS {
	const n, pens = 200_000, 1000
	var enc, an, de, ob, tr, li bytes.Buffer
	enc.WriteString("enclosure_id,building_id,kind,length_cm,width_cm,height_cm,nest_box\n")
	an.WriteString("animal_id,species,sex,arrived_on,enclosure_id\n")
	for i := range pens {
		fmt.Fprintf(&enc, "E%04d,S1,cage,120,100,80,yes\n", i)
		fmt.Fprintf(&an, "A%04d,vulpes_vulpes,f,2020-01-01,E%04d\n", i, i)
	}
	start := time.Date(2025, 1, 1, 7, 0, 0, 0, time.UTC)
	causes := []string{"", "unknown", "injury", "disease", "cold", "fight"}
	signs := []string{"", "wound", "lameness;lethargy", "stereotypy", "", "fur_chewing"}
	de.WriteString("animal_id,found_dead_at,found_by,suspected_cause,vet_notified_at,necropsy,necropsy_ref,disposal\n")
	ob.WriteString("observed_at,animal_id,staff_id,mass_kg,body_condition,signs,vet_informed,notes\n")
	tr.WriteString("case_id,animal_id,opened_on,diagnosis,prescribed_by,reviewed_on,closed_on,outcome\n")
	li.WriteString("litter_id,dam_id,whelped_on,born,born_alive,weaned_on,weaned\n")
	for i := range n {
		at := start.Add(time.Duration(i) * time.Minute)
		day := at.Format("2006-01-02")
		// deaths.csv: one row per animal, so the ids repeat across blocks of
		// 1,000 only in different folders; here each row names its own id.
		fmt.Fprintf(&de, "D%06d,%s,K%d,%s,%s,no,,rendering\n", i, at.Format("2006-01-02T15:04"), i%7, causes[i%6], at.Add(3*time.Hour).Format("2006-01-02T15:04"))
		fmt.Fprintf(&ob, "%s,A%04d,K%d,%.1f,%d,%s,no,\n", at.Format("2006-01-02T15:04"), i%pens, i%7, 5+float64(i%30)/10, 1+i%5, signs[i%6])
		fmt.Fprintf(&tr, "C%06d,A%04d,%s,bite wound,K0,%s,,\n", i, i%pens, day, day)
		fmt.Fprintf(&li, "L%06d,A%04d,2024-05-01,%d,%d,2024-07-01,%d\n", i, i%pens, 6, 5, 4)
	}
	staff := "staff_id,name,role\n"
	for i := range 7 {
		staff += fmt.Sprintf("K%d,Keeper %d,keeper\n", i, i)
	}
	// deaths.csv names animals by their own id: give them animal rows.
	var dead bytes.Buffer
	dead.WriteString(an.String())
	for i := range n {
		fmt.Fprintf(&dead, "D%06d,vulpes_vulpes,m,2020-01-01,E%04d\n", i, i%pens)
	}
	return fstest.MapFS{
		"facility.yaml":    {Data: []byte("name: Birchfall Fur Research Station\ntime_zone: America/Winnipeg\nbuildings:\n  - id: S1\n    exposure: outdoor\n")},
		"animals.csv":      {Data: an.Bytes()},
		"animals_dead.csv": {Data: dead.Bytes()},
		"enclosures.csv":   {Data: enc.Bytes()},
		"staff.csv":        {Data: []byte(staff)},
		"deaths.csv":       {Data: de.Bytes()},
		"observations.csv": {Data: ob.Bytes()},
		"treatments.csv":   {Data: tr.Bytes()},
		"litters.csv":      {Data: li.Bytes()},
	}
})

// BenchmarkLoadHealth loads a folder holding one of the health files with
// 200,000 rows; rows/s counts that file's rows.
func BenchmarkLoadHealth(b *testing.B) {
	all := healthBenchFolder()
	for _, file := range []string{deathsFile, observationsFile, treatmentsFile, littersFile} {
		b.Run(file, func(b *testing.B) {
			fsys := fstest.MapFS{}
			for _, k := range []string{"facility.yaml", "animals.csv", "enclosures.csv", "staff.csv", file} {
				fsys[k] = all[k]
			}
			if file == deathsFile {
				fsys["animals.csv"] = all["animals_dead.csv"]
			}
			b.ReportAllocs()
			b.ResetTimer()
			cpu0 := cpuTime()
			var rows int
			for b.Loop() {
				s, err := Load(fsys, Options{Species: []string{"vulpes_vulpes"}})
				if err != nil {
					b.Fatal(err)
				}
				got := len(s.Deaths) + len(s.Observations) + len(s.Treatments) + len(s.Litters)
				if got != 200_000 || len(s.Problems) != 0 {
					b.Fatalf("%s: rows = %d, problems = %d (first %v)", file, got, len(s.Problems), s.Problems[:min(1, len(s.Problems))])
				}
				rows += got
			}
			b.ReportMetric(float64(rows)/b.Elapsed().Seconds(), "rows/s")
			b.ReportMetric(float64(cpuTime()-cpu0)/float64(rows), "cpu-ns/row")
		})
	}
}
