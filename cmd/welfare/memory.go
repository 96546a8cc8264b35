package main

import (
	"runtime"
	"runtime/debug"
)

// gcAuto is set when the user left both GOGC and GOMEMLIMIT unset: the
// collector's pacing is then ours to set (see paceMemory).
var gcAuto bool

// minMemoryLimit is the smallest soft memory limit paceMemory sets.
const minMemoryLimit = 256 << 20

// paceMemory sets a soft memory limit of 1.6 times the live heap, at least
// minMemoryLimit, when the user left the collector to us. A check calls it
// as its facts start: the loaded records are then most of what it will
// ever hold (the care rounds go once the facts that read them are built,
// and the rules' documents are made subject by subject), so the limit
// keeps the collector's headroom to 60 % of that instead of the default
// 100 % of whatever is live. The limit is soft: should the heap still
// outgrow it, the runtime bounds the time spent collecting rather than
// failing. On the 10,000-animal generated year this took the peak
// resident memory from 971 to about 545 MB for a few per cent more CPU
// time (README, Performance).
//
// The forced collection measures the live heap exactly; most of it is the
// care rounds' pointer-free store, which the collector need not scan.
func paceMemory() {
	if !gcAuto {
		return
	}
	runtime.GC()
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	debug.SetMemoryLimit(max(int64(minMemoryLimit), int64(ms.HeapAlloc)*16/10))
	paced = true
}

// paced: paceMemory has set the soft memory limit.
var paced bool

// paceRules lets the collector run only at the soft memory limit while the
// rules are evaluated, when paceMemory set one. The rules' phase holds less
// than the facts' (the care rounds are gone, and each kind's documents go
// once evaluated) but allocates several times that in short-lived values
// (each subject's converted document and its evaluation); at the default
// GOGC the collector then ran every ~200 MB allocated, marking the whole
// live heap each time. The limit still bounds the heap: peak memory stays
// that of the facts' phase. The default returns with the reports
// (paceReports).
func paceRules() {
	if gcAuto && paced {
		debug.SetGCPercent(-1)
	}
}

// paceReports undoes paceRules.
func paceReports() {
	if gcAuto && paced {
		debug.SetGCPercent(100)
	}
}
