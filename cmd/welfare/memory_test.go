package main

import (
	"math"
	"os"
	"path/filepath"
	"runtime"
	"runtime/debug"
	"testing"
)

// TestPaceMemory: the soft limit is set only when the user left GOGC and
// GOMEMLIMIT unset; the facts then run with the collector waiting for twice
// the heap as they start, and the rules under a limit of 1.8 times it; a
// heap whose limit would be under the floor is left to the default pacing.
func TestPaceMemory(t *testing.T) {
	before := debug.SetMemoryLimit(-1)
	defer debug.SetMemoryLimit(before)
	defer debug.SetGCPercent(debug.SetGCPercent(100))
	defer func(a, p bool, l int64) { gcAuto, paced, memoryLimit = a, p, l }(gcAuto, paced, memoryLimit)

	debug.SetMemoryLimit(math.MaxInt64)
	gcAuto, paced = false, false
	paceMemory()
	if got := debug.SetMemoryLimit(-1); got != math.MaxInt64 {
		t.Fatalf("GOGC or GOMEMLIMIT set by the user: the limit changed to %d", got)
	}

	// A small heap (this test's, well under the floor) is left to the
	// default pacing: no limit, the collector on, nothing paced.
	gcAuto = true
	runtime.GC()
	paceMemory()
	if got := debug.SetMemoryLimit(-1); got != math.MaxInt64 || paced {
		t.Fatalf("a small heap: limit %d, paced %v; want none set", got, paced)
	}
	if v := debug.SetGCPercent(100); v != 100 {
		t.Errorf("a small heap: GC percent %d, want the default 100", v)
	}
	// With a live heap over the floor, the limits follow it.
	keep := make([][]byte, 0, 40)
	for range 40 {
		keep = append(keep, make([]byte, 8<<20)) // 320 MiB in all
	}
	paceMemory()
	if got, low := debug.SetMemoryLimit(-1), int64(320<<20)*2; got < low {
		t.Fatalf("facts' limit %d MiB with over 320 MiB live, want at least %d MiB", got>>20, low>>20)
	}
	if v := debug.SetGCPercent(-1); v != -1 {
		t.Errorf("GC percent during the facts %d, want -1 (only at the limit)", v)
	}
	paceRules()
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	got := debug.SetMemoryLimit(-1)
	if low, high := int64(320<<20)*18/10, int64(ms.HeapAlloc)*18/10+1; got < low || got > high {
		t.Fatalf("rules' limit %d MiB with over 320 MiB live, want %d to %d MiB", got>>20, low>>20, high>>20)
	}
	runtime.KeepAlive(keep)
}

// TestPaceRules: while the rules are evaluated the collector runs only at
// the soft limit, and only when paceMemory set one (the user left GOGC and
// GOMEMLIMIT unset); the reports have the default pacing again.
func TestPaceRules(t *testing.T) {
	defer debug.SetGCPercent(debug.SetGCPercent(100))
	defer debug.SetMemoryLimit(debug.SetMemoryLimit(-1))
	defer func(a, p bool, l int64) { gcAuto, paced, memoryLimit = a, p, l }(gcAuto, paced, memoryLimit)

	gcPercent := func() int {
		v := debug.SetGCPercent(100)
		debug.SetGCPercent(v)
		return v
	}
	for _, tt := range []struct {
		auto, paced bool
		during      int
	}{
		{false, false, 100}, // GOGC or GOMEMLIMIT set by the user
		{false, true, 100},
		{true, false, 100}, // no limit set: the heap would not be bounded
		{true, true, -1},
	} {
		debug.SetGCPercent(100)
		gcAuto, paced, memoryLimit = tt.auto, tt.paced, math.MaxInt64
		paceRules()
		if got := gcPercent(); got != tt.during {
			t.Errorf("auto %v, limit set %v: GC percent during the rules %d, want %d", tt.auto, tt.paced, got, tt.during)
		}
		paceReports()
		if got := gcPercent(); got != 100 {
			t.Errorf("auto %v, limit set %v: GC percent during the reports %d, want 100", tt.auto, tt.paced, got)
		}
	}
}

// TestPaceLoad: while the records are read the collector waits for twice
// the files' bytes, only when the user left it to us and that is over the
// floor; a check whose heap then proves small returns to the default.
func TestPaceLoad(t *testing.T) {
	defer debug.SetGCPercent(debug.SetGCPercent(100))
	defer debug.SetMemoryLimit(debug.SetMemoryLimit(-1))
	defer func(a, p, l bool, m int64) { gcAuto, paced, loadPaced, memoryLimit = a, p, l, m }(gcAuto, paced, loadPaced, memoryLimit)
	limit := func() int64 { return debug.SetMemoryLimit(-1) }

	debug.SetMemoryLimit(math.MaxInt64)
	gcAuto, loadPaced = false, false
	paceLoad(1 << 30)
	if limit() != math.MaxInt64 || loadPaced {
		t.Fatalf("GOGC or GOMEMLIMIT set by the user: limit %d, paced %v", limit(), loadPaced)
	}
	gcAuto = true
	paceLoad(minMemoryLimit/2 - 1)
	if limit() != math.MaxInt64 || loadPaced {
		t.Fatalf("files of %d bytes: limit %d, paced %v; want the default", minMemoryLimit/2-1, limit(), loadPaced)
	}
	paceLoad(300 << 20)
	if got := limit(); got != 600<<20 || !loadPaced {
		t.Fatalf("files of 300 MiB: limit %d MiB, paced %v; want 600 MiB", got>>20, loadPaced)
	}
	if v := debug.SetGCPercent(-1); v != -1 {
		t.Errorf("GC percent during the load %d, want -1", v)
	}
	// This test's heap is small: the facts return to the default pacing.
	paceMemory()
	if limit() != math.MaxInt64 || loadPaced || paced {
		t.Fatalf("a small heap after a paced load: limit %d, load paced %v, paced %v; want the default", limit(), loadPaced, paced)
	}
	if v := debug.SetGCPercent(100); v != 100 {
		t.Errorf("a small heap after a paced load: GC percent %d, want 100", v)
	}
}

func TestFolderBytes(t *testing.T) {
	dir := t.TempDir()
	for name, n := range map[string]int{"animals.csv": 100, "daily_care.csv": 2500, "facility.yaml": 40} {
		if err := os.WriteFile(filepath.Join(dir, name), make([]byte, n), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	if err := os.Mkdir(filepath.Join(dir, "previous"), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(filepath.Join(dir, "previous", "findings.json"), make([]byte, 999), 0o644); err != nil {
		t.Fatal(err)
	}
	if got := folderBytes(dir); got != 2600 {
		t.Errorf("folderBytes = %d, want 2600 (the CSV files directly in the folder)", got)
	}
	if err := os.WriteFile(filepath.Join(dir, "care.xlsx"), make([]byte, 700), 0o644); err != nil {
		t.Fatal(err)
	}
	if got := folderBytes(dir); got != 0 {
		t.Errorf("a folder with a workbook: %d, want 0 (the default pacing)", got)
	}
	if got := folderBytes(filepath.Join(dir, "missing")); got != 0 {
		t.Errorf("a folder that cannot be listed: %d, want 0", got)
	}
}
