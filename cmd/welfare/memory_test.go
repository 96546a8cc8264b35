package main

import (
	"math"
	"runtime"
	"runtime/debug"
	"testing"
)

// TestPaceMemory: the soft limit is set only when the user left GOGC and
// GOMEMLIMIT unset, and then to 1.6 times the live heap, never below the
// floor.
func TestPaceMemory(t *testing.T) {
	before := debug.SetMemoryLimit(-1)
	defer debug.SetMemoryLimit(before)
	defer func(v bool) { gcAuto = v }(gcAuto)

	debug.SetMemoryLimit(math.MaxInt64)
	gcAuto = false
	paceMemory()
	if got := debug.SetMemoryLimit(-1); got != math.MaxInt64 {
		t.Fatalf("GOGC or GOMEMLIMIT set by the user: the limit changed to %d", got)
	}

	gcAuto = true
	paceMemory()
	got := debug.SetMemoryLimit(-1)
	if got < minMemoryLimit {
		t.Fatalf("limit %d is below the floor %d", got, minMemoryLimit)
	}
	// With a live heap over the floor, the limit follows it.
	keep := make([][]byte, 0, 40)
	for range 40 {
		keep = append(keep, make([]byte, 8<<20)) // 320 MiB in all
	}
	paceMemory()
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	got = debug.SetMemoryLimit(-1)
	if low := int64(320<<20) * 16 / 10; got < low {
		t.Fatalf("limit %d MiB with over 320 MiB live, want at least %d MiB", got>>20, low>>20)
	}
	runtime.KeepAlive(keep)
}

// TestPaceRules: while the rules are evaluated the collector runs only at
// the soft limit, and only when paceMemory set one (the user left GOGC and
// GOMEMLIMIT unset); the reports have the default pacing again.
func TestPaceRules(t *testing.T) {
	defer debug.SetGCPercent(debug.SetGCPercent(100))
	defer debug.SetMemoryLimit(debug.SetMemoryLimit(-1))
	defer func(a, p bool) { gcAuto, paced = a, p }(gcAuto, paced)

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
		gcAuto, paced = tt.auto, tt.paced
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
