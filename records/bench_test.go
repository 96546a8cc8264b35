package records

import (
	"bytes"
	"fmt"
	"sync"
	"syscall"
	"testing"
	"testing/fstest"
	"time"
)

// careFolder builds, once, a valid folder with n daily care rounds over
// 1,000 enclosures: the size of a large colony's year of rounds.
var careFolder = sync.OnceValue(func() fstest.MapFS {
	const n, pens = 1_000_000, 1000
	var enc, care bytes.Buffer
	enc.WriteString("enclosure_id,building_id,kind,length_cm,width_cm,height_cm,nest_box\n")
	for i := range pens {
		fmt.Fprintf(&enc, "E%04d,S1,cage,120,100,80,yes\n", i)
	}
	care.Grow(n * 90)
	care.WriteString("checked_at,enclosure_id,staff_id,observed,fed,feed_g,water,water_restored,bedding_added,cleaned,health_concern,notes\n")
	start := time.Date(2025, 1, 1, 7, 0, 0, 0, time.UTC)
	waters := []string{"ok", "low", "frozen", "ok", "empty"}
	for i := range n {
		at := start.Add(time.Duration(i/pens) * 12 * time.Hour)
		fmt.Fprintf(&care, "%s,E%04d,K%d,yes,%s,%d,%s,yes,no,,no,\n",
			at.Format("2006-01-02T15:04"), i%pens, i%7, []string{"yes", "no"}[i%2], 200+i%300, waters[i%5])
	}
	staff := "staff_id,name,role\n"
	for i := range 7 {
		staff += fmt.Sprintf("K%d,Keeper %d,keeper\n", i, i)
	}
	return fstest.MapFS{
		"facility.yaml":  {Data: []byte("name: Birchfall Fur Research Station\ntime_zone: America/Winnipeg\nbuildings:\n  - id: S1\n    exposure: outdoor\n")},
		"animals.csv":    {Data: []byte("animal_id,species,arrived_on,enclosure_id\nA1,vulpes_vulpes,2024-05-01,E0001\n")},
		"enclosures.csv": {Data: enc.Bytes()},
		"staff.csv":      {Data: []byte(staff)},
		"daily_care.csv": {Data: care.Bytes()},
	}
})

func BenchmarkLoadDailyCare1M(b *testing.B) {
	fsys := careFolder()
	b.ReportAllocs()
	b.ResetTimer()
	cpu0 := cpuTime()
	var rows int
	for b.Loop() {
		s, err := Load(fsys, Options{Species: []string{"vulpes_vulpes"}})
		if err != nil {
			b.Fatal(err)
		}
		if s.CareRounds().Len() != 1_000_000 || len(s.Problems) != 0 {
			b.Fatalf("care rows = %d, problems = %d (first %v)", s.CareRounds().Len(), len(s.Problems), s.Problems)
		}
		rows += s.CareRounds().Len()
	}
	b.ReportMetric(float64(rows)/b.Elapsed().Seconds(), "rows/s")
	// CPU time (all threads, GC included) per row does not depend on what
	// else the shared machine is running, unlike wall-clock rows/s.
	b.ReportMetric(float64(cpuTime()-cpu0)/float64(rows), "cpu-ns/row")
}

// cpuTime is the process's user+system CPU time.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}
