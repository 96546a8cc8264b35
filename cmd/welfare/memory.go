package main

import (
	"math"
	"os"
	"path/filepath"
	"runtime"
	"runtime/debug"
	"strings"
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
//   - paceLoad, as the records are read, lets the collector wait for twice
//     the CSV files' bytes: nearly all the loader allocates stays live.
//   - paceMemory, as the facts start, collects once if the load ran
//     without collecting, and takes the heap then — the loaded records,
//     most of what the check will ever hold (the care rounds go once the
//     facts that read them are built, and the rules' documents are made
//     subject by subject) — as the measure the soft memory limit is set
//     from: 1.8 times it (a check whose limit would be under
//     minMemoryLimit is left to the default pacing), so the collector's
//     headroom is 80 % of that instead of the default 100 % of whatever is
//     live. On the 10,000-animal generated year: 1.6 times gave 5.1 s and
//     558 MB resident, 1.8 times 4.9 s and 590 MB (the target is 640 MiB);
//     the default pacing 9.2 s and 971 MB before the rules were evaluated
//     with the collector off (README, Performance). Until the care rounds
//     go, the collector waits for twice that heap, as the default pacing
//     would after a collection: a collection while the rounds are live
//     marks them all and frees next to nothing (the builders reading them
//     keep what they make), and the builders stay well under that bound.
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
	if loadPaced {
		// The load ran without collecting: its garbage is in the heap.
		// One collection now (about 40 ms of CPU at 10,000 animals) gives
		// the live heap the limits are set from.
		runtime.GC()
	}
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	heap := int64(ms.HeapAlloc)
	if heap*18/10 < minMemoryLimit {
		if loadPaced { // the default again, as for any small check
			debug.SetMemoryLimit(math.MaxInt64)
			debug.SetGCPercent(100)
			loadPaced = false
		}
		return
	}
	memoryLimit = heap * 18 / 10
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

// loadPaced: paceLoad has set a limit for the load.
var loadPaced bool

// paceLoad lets the collector wait, while the records are read, for a
// heap of twice the record files' bytes, when the user left the collector
// to us and that is over minMemoryLimit. The loaded records take about
// their files' size (334 MiB of heap for 298 MB of CSV at 10,000 animals)
// and nearly everything the loader allocates stays live, so collections
// while they grow mark the same records again and again and free little:
// at 10,000 animals about 20 of them, 0.2 s of a check's load. The heap
// stays under what the facts reach next (paceMemory then sets their own
// pacing), and the limit is soft: should the records take more than
// twice their bytes, the collector runs as under any limit.
func paceLoad(fileBytes int64) {
	if !gcAuto || 2*fileBytes < minMemoryLimit {
		return
	}
	debug.SetMemoryLimit(2 * fileBytes)
	debug.SetGCPercent(-1)
	loadPaced = true
}

// folderBytes is the size of the CSV files directly in dir; 0, so the
// load runs at the default pacing, when it cannot be listed or holds a
// workbook. CSV rows take about their bytes once loaded; a workbook is
// compressed and may take many times its size, which would put the
// load's limit under its heap and the collector to work all the time.
func folderBytes(dir string) int64 {
	entries, err := os.ReadDir(dir)
	if err != nil {
		return 0
	}
	var n int64
	for _, e := range entries {
		ext := strings.ToLower(filepath.Ext(e.Name()))
		if ext == ".xlsx" {
			return 0
		}
		if !e.Type().IsRegular() || ext != ".csv" {
			continue
		}
		if info, err := e.Info(); err == nil {
			n += info.Size()
		}
	}
	return n
}
