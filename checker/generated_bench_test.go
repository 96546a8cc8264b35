package checker

import (
	"context"
	"fmt"
	"os"
	"syscall"
	"testing"
	"time"

	"welfare/records"
	"welfare/records/synth"
	"welfare/rules"
)

// BenchmarkGenerated times the checker's steps on a generated folder
// (welfare generate --days 365 --seed 7) at 1,000 and 10,000 animals: facts
// builds every subject's document from the loaded records; rules evaluates
// every shipped rule on documents built beforehand; check is both, as Check
// runs them, and requires the findings to number the planted ones. Each
// reports its CPU time per op too (cpu-ns/op), steadier than the wall time
// on a machine other work shares.
//
//	go test ./checker -run '^$' -bench 'Generated/animals=1000$/' -benchmem
func BenchmarkGenerated(b *testing.B) {
	lim := defaultLimits(b)
	engine := shippedEngine(b, lim)
	ctx := context.Background()
	for _, n := range []int{1000, 10000} {
		b.Run(fmt.Sprintf("animals=%d", n), func(b *testing.B) {
			set, planted := generatedSet(b, n, lim)
			from, to := recordSpan(set)
			period := Period{From: from, To: to}
			build := func() *facts {
				f := newFacts(set, lim, period)
				buildFacts(f, nil)
				return f
			}
			b.Run("facts", func(b *testing.B) {
				b.ReportAllocs()
				defer reportCPU(b)()
				for b.Loop() {
					build()
				}
			})
			b.Run("rules", func(b *testing.B) {
				f := build()
				kinds := map[string][]map[string]any{}
				for _, k := range engine.Kinds() {
					kinds[k] = f.inputs(k)
				}
				b.ReportAllocs()
				defer reportCPU(b)()
				for b.Loop() {
					for _, k := range engine.Kinds() {
						if len(kinds[k]) == 0 {
							continue
						}
						if _, err := engine.Evaluate(ctx, k, kinds[k]); err != nil {
							b.Fatal(err)
						}
					}
				}
			})
			b.Run("check", func(b *testing.B) {
				b.ReportAllocs()
				defer reportCPU(b)()
				var found int
				for b.Loop() {
					res, err := Check(ctx, Config{Records: set, Limits: lim, Engine: engine, Period: period})
					if err != nil {
						b.Fatal(err)
					}
					found = len(res.Findings)
				}
				if found != planted {
					b.Fatalf("%d findings, %d planted", found, planted)
				}
				b.ReportMetric(float64(found), "findings")
			})
		})
	}
}

// generatedSet generates and loads a folder of n animals over a year.
func generatedSet(b testing.TB, n int, lim *rules.Limits) (*records.Set, int) {
	b.Helper()
	dir := b.TempDir()
	planted, err := synth.Generate(dir, synth.Options{Animals: n, Days: 365, Seed: 7})
	if err != nil {
		b.Fatal(err)
	}
	set, err := records.Load(os.DirFS(dir), records.Options{Species: lim.SpeciesCodes()})
	if err != nil {
		b.Fatal(err)
	}
	return set, len(planted)
}

// reportCPU reports the CPU time (user and system, every thread, the
// garbage collector's included) the benchmark took per op: on a shared
// machine it varies less than the wall time does. Call as
// defer reportCPU(b)().
func reportCPU(b *testing.B) func() {
	start := cpuTime()
	return func() {
		b.ReportMetric(float64(cpuTime()-start)/float64(b.N), "cpu-ns/op")
	}
}

func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}
