package main

import (
	"fmt"
	"io"
	"os"
	"runtime/metrics"
	"sync"
	"sync/atomic"
	"time"

	"github.com/schollz/progressbar/v3"
)

// phases follows a run through its steps (load, facts, rules, reports): with
// --timings it prints each step's wall time, peak heap and CPU time to
// stderr at the end; when stderr is a terminal it shows a progress line
// (step, rows or subjects, rate) for a step that has run longer than a
// second. Pipes, CI and tests see neither unless they ask for --timings.
type phases struct {
	timings io.Writer // nil: no timings
	tty     io.Writer // nil: no progress display

	mu    sync.Mutex
	name  string
	unit  string
	start time.Time
	cpu0  time.Duration // the process's CPU time as the step started
	bar   *progressbar.ProgressBar
	done  []phaseTime
	t0    time.Time

	count     atomic.Int64
	peakHeap  atomic.Uint64 // during the current step
	peakTotal atomic.Uint64 // over the whole run
	stop      chan struct{}
	stopped   sync.WaitGroup
}

type phaseTime struct {
	name     string
	wall     time.Duration
	peakHeap uint64
	cpu      time.Duration // -1: not measured
}

// progressAfter is how long a step runs before its progress line appears.
const progressAfter = time.Second

func newPhases(stderr io.Writer, timings bool) *phases {
	p := &phases{t0: time.Now(), stop: make(chan struct{})}
	if timings {
		p.timings = stderr
	}
	if isTerminal(stderr) {
		p.tty = stderr
	}
	if p.timings != nil || p.tty != nil {
		p.stopped.Add(1)
		go p.watch()
	}
	return p
}

// isTerminal reports whether w is a character device (a terminal), not a
// file, a pipe or a test's buffer.
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	st, err := f.Stat()
	return err == nil && st.Mode()&os.ModeCharDevice != 0
}

// enter ends the current step and starts the next; unit names what add
// and set count ("rows", "subjects"), empty when the step has no count.
func (p *phases) enter(name, unit string) {
	p.mu.Lock()
	defer p.mu.Unlock()
	p.endLocked()
	p.name, p.unit, p.start = name, unit, time.Now()
	p.cpu0, _ = cpuTime()
	p.count.Store(0)
	p.peakHeap.Store(0)
	p.sample()
}

// add counts n more rows (safe from any goroutine).
func (p *phases) add(n int) { p.count.Add(int64(n)) }

// set sets the count of the current step.
func (p *phases) set(n int) { p.count.Store(int64(n)) }

func (p *phases) endLocked() {
	if p.name == "" {
		return
	}
	p.sample()
	cpu, ok := cpuTime()
	if !ok {
		cpu = p.cpu0 - 1
	}
	p.done = append(p.done, phaseTime{p.name, time.Since(p.start), p.peakHeap.Load(), cpu - p.cpu0})
	if p.bar != nil {
		_ = p.bar.Finish()
		p.bar = nil
	}
	p.name = ""
}

// finish ends the last step, stops the watcher and prints the timings.
func (p *phases) finish() {
	p.mu.Lock()
	p.endLocked()
	p.mu.Unlock()
	select {
	case <-p.stop:
	default:
		close(p.stop)
	}
	p.stopped.Wait()
	if p.timings == nil {
		return
	}
	fmt.Fprintln(p.timings, "timings (wall time, peak heap in use, CPU time of every thread):")
	var peak uint64
	for _, t := range p.done {
		fmt.Fprintf(p.timings, "  %-12s %8.3f s  %8s%s\n", t.name, t.wall.Seconds(), mib(t.peakHeap), cpuText(t.cpu))
		peak = max(peak, t.peakHeap)
	}
	total, ok := cpuTime()
	if !ok {
		total = -1
	}
	fmt.Fprintf(p.timings, "  %-12s %8.3f s  %8s%s  (Go runtime memory at most %s)\n", "total", time.Since(p.t0).Seconds(), mib(peak), cpuText(total), mib(p.peakTotal.Load()))
}

// cpuText is a step's CPU time as a column of the timings, empty when
// not measured.
func cpuText(d time.Duration) string {
	if d < 0 {
		return ""
	}
	return fmt.Sprintf("  %8.3f s CPU", d.Seconds())
}

func mib(b uint64) string { return fmt.Sprintf("%.0f MiB", float64(b)/(1<<20)) }

// watch samples the heap every 10 ms and draws the progress line.
func (p *phases) watch() {
	defer p.stopped.Done()
	tick := time.NewTicker(10 * time.Millisecond)
	defer tick.Stop()
	for n := 0; ; n++ {
		select {
		case <-p.stop:
			return
		case <-tick.C:
		}
		p.sample()
		if p.tty != nil && n%20 == 0 {
			p.draw()
		}
	}
}

var heapSamples = []metrics.Sample{{Name: "/memory/classes/heap/objects:bytes"}, {Name: "/memory/classes/total:bytes"}}

// sample raises the peaks to the heap in use now.
func (p *phases) sample() {
	s := make([]metrics.Sample, len(heapSamples))
	copy(s, heapSamples)
	metrics.Read(s)
	raise := func(a *atomic.Uint64, v metrics.Value) {
		if v.Kind() != metrics.KindUint64 {
			return
		}
		for {
			old := a.Load()
			if v.Uint64() <= old || a.CompareAndSwap(old, v.Uint64()) {
				return
			}
		}
	}
	raise(&p.peakHeap, s[0].Value)
	raise(&p.peakTotal, s[1].Value)
}

func (p *phases) draw() {
	p.mu.Lock()
	defer p.mu.Unlock()
	elapsed := time.Since(p.start)
	if p.name == "" || elapsed < progressAfter {
		return
	}
	if p.bar == nil {
		p.bar = progressbar.NewOptions64(-1, progressbar.OptionSetWriter(p.tty), progressbar.OptionSpinnerType(14),
			progressbar.OptionClearOnFinish(), progressbar.OptionSetElapsedTime(false))
	}
	// The rate is the step's own, from its start, not the display's.
	desc := fmt.Sprintf("%s %.0fs", p.name, elapsed.Seconds())
	if n := p.count.Load(); p.unit != "" {
		desc = fmt.Sprintf("%s %.0fs: %d %s, %.0f %s/s", p.name, elapsed.Seconds(), n, p.unit, float64(n)/elapsed.Seconds(), p.unit)
	}
	p.bar.Describe(desc)
	_ = p.bar.Add(1)
}
