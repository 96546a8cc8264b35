package records

import (
	"fmt"
	"strings"
	"sync/atomic"
	"testing"
	"testing/fstest"
)

// Progress is told the rows read, in steps, and only reports: the load is
// the same with it as without.
func TestLoadReportsProgress(t *testing.T) {
	const rounds = 3*progressEvery + 100
	var care strings.Builder
	care.WriteString("checked_at,enclosure_id,staff_id,observed\n")
	for i := range rounds {
		fmt.Fprintf(&care, "2026-01-%02dT07:30,E1,K1,yes\n", 1+i%28)
	}
	fsys := fstest.MapFS{
		"facility.yaml":  {Data: []byte("name: Birchfall Fur Research Station\ntime_zone: America/Winnipeg\nbuildings:\n  - id: S1\n    exposure: outdoor\n")},
		"animals.csv":    {Data: []byte("animal_id,species,arrived_on,enclosure_id\nA1,vulpes_vulpes,2025-05-01,E1\n")},
		"enclosures.csv": {Data: []byte("enclosure_id,building_id,kind,length_cm,width_cm,height_cm\nE1,S1,cage,120,85,80\n")},
		"staff.csv":      {Data: []byte("staff_id,name,role\nK1,Keeper One,keeper\n")},
		"daily_care.csv": {Data: []byte(care.String())},
	}
	var reported, calls atomic.Int64
	opt := Options{Species: []string{"vulpes_vulpes"}}
	quiet, err := Load(fsys, opt)
	if err != nil {
		t.Fatal(err)
	}
	opt.Progress = func(n int) { reported.Add(int64(n)); calls.Add(1) }
	s, err := Load(fsys, opt)
	if err != nil {
		t.Fatal(err)
	}
	if s.CareRounds().Len() != rounds || s.CareRounds().Len() != quiet.CareRounds().Len() || len(s.Problems) != 0 {
		t.Fatalf("care rows %d (without progress %d), %d problems", s.CareRounds().Len(), quiet.CareRounds().Len(), len(s.Problems))
	}
	// Three full steps of the care file; the small files never reach one.
	if got, want := reported.Load(), int64(3*progressEvery); got != want || calls.Load() != 3 {
		t.Errorf("progress reported %d rows in %d calls, want %d in 3", got, calls.Load(), want)
	}
}
