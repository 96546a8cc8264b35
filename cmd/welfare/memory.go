package main

import (
	"runtime"
	"runtime/debug"
)

// gcAuto is set when the user left both GOGC and GOMEMLIMIT unset: the
// collector's pacing is then ours to set (see paceMemory).
var gcAuto bool

// minMemoryLimit is the smallest soft memory limit paceMemory sets: a
// check whose limit would be smaller is left to the default pacing (its
// heap is small, and with the collector off until a floor it would grow
// to the floor: 105 MiB became 255 MiB at 1,000 animals).
const minMemoryLimit = 256 << 20

// The collector's pacing over a check, when the user left it to us:
//
//   - paceMemory, as the facts start, takes the heap then — the loaded
//     records, most of what the check will ever hold (the care rounds go
//     once the facts that read them are built, and the rules' documents
//     are made subject by subject) — as the measure the soft memory limit
//     is set from: 1.6 times it (a smaller check than minMemoryLimit is left
//     to the default pacing), so the
//     collector's headroom is 60 % of that instead of the default 100 % of
//     whatever is live. On the 10,000-animal generated year this took the
//     peak resident memory from 971 to about 545 MB for a few per cent more
//     CPU time (README, Performance). Until the care rounds go, the
//     collector waits for twice that heap, as the default pacing would
//     after a collection: a collection while the rounds are live marks
//     them all and frees next to nothing (the builders reading them keep
//     what they make), and the builders stay well under that bound.
//   - paceReleased, as the rounds are let go, starts a collection in the
//     background: most of the heap is then the rounds' garbage, taken while
//     the other builders run on.
//   - paceRules lets the collector run only at the soft limit while the
//     rules are evaluated; paceReports returns the default.
//
// The heap is read without a collection: it is an upper bound of the live
// heap (on the generated years, the loaded records are all but 1 % of it;
// a forced collection cost 40 ms of CPU time at 10,000 animals), and
// should it hold garbage, the limit is looser, never tighter, than asked.
// The limit is soft: should the heap still outgrow it, the runtime bounds
// the time spent collecting rather than failing.
func paceMemory() {
	if !gcAuto {
		return
	}
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	heap := int64(ms.HeapAlloc)
	if heap*16/10 < minMemoryLimit {
		return
	}
	memoryLimit = heap * 16 / 10
	debug.SetMemoryLimit(heap * 2)
	debug.SetGCPercent(-1)
	paced = true
}

// paced: paceMemory has set the soft memory limit; memoryLimit is the one
// the rules run under.
var (
	paced       bool
	memoryLimit int64
)

// paceReleased starts a collection in the background once the care rounds
// are let go (see paceMemory).
func paceReleased() {
	if gcAuto && paced {
		go runtime.GC()
	}
}

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
		debug.SetMemoryLimit(memoryLimit)
		debug.SetGCPercent(-1)
	}
}

// paceReports undoes paceRules.
func paceReports() {
	if gcAuto && paced {
		debug.SetGCPercent(100)
	}
}
