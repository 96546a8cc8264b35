package records

import (
	"bytes"
	"fmt"
	"maps"
	"testing"
	"testing/fstest"
)

// BenchmarkPrefetch loads the folder of BenchmarkLoadDailyCare1M, its care
// file cut to 10,000, 100,000 and 1,000,000 rounds (about 0.9, 9 and 90 MB),
// with the care file read directly and read by the prefetching reader:
//
//	for i in 1 2 3; do go test ./records -run '^$' -bench 'Prefetch$' -benchmem -count 1; done
//
// (one run at a time, so direct and prefetch alternate on a shared machine).
func BenchmarkPrefetch(b *testing.B) {
	full := careFolder()
	for _, n := range []int{10_000, 100_000, 1_000_000} {
		fsys := fstest.MapFS{}
		maps.Copy(fsys, full)
		data := full[careFile].Data
		cut := 0
		for range n + 1 {
			cut += bytes.IndexByte(data[cut:], '\n') + 1
		}
		fsys[careFile] = &fstest.MapFile{Data: data[:cut]}
		for _, c := range []struct {
			name string
			min  int64
		}{{"direct", 1 << 62}, {"prefetch", 0}} {
			b.Run(fmt.Sprintf("rounds=%d/%s", n, c.name), func(b *testing.B) {
				defer setPrefetchMin(c.min)()
				b.ReportAllocs()
				cpu0 := cpuTime()
				var rows int
				for b.Loop() {
					s, err := Load(fsys, Options{Species: []string{"vulpes_vulpes"}})
					if err != nil {
						b.Fatal(err)
					}
					if s.CareRounds().Len() != n || len(s.Problems) != 0 {
						b.Fatalf("care rows = %d, problems = %d", s.CareRounds().Len(), len(s.Problems))
					}
					rows += n
				}
				b.ReportMetric(float64(rows)/b.Elapsed().Seconds(), "rows/s")
				b.ReportMetric(float64(cpuTime()-cpu0)/float64(rows), "cpu-ns/row")
			})
		}
	}
}

// BenchmarkPrefetchRead reads the care file of that folder through each
// reader and only counts its cells: the cost of tokenizing and of handing
// rows over, without the decoding it is meant to overlap.
func BenchmarkPrefetchRead(b *testing.B) {
	data := careFolder()[careFile].Data
	for _, c := range []string{"direct", "prefetch"} {
		b.Run(c, func(b *testing.B) {
			b.SetBytes(int64(len(data)))
			b.ReportAllocs()
			for b.Loop() {
				var rr rowReader
				if c == "direct" {
					rr = &csvRows{r: newCSVReader(bytes.NewReader(data)), base: careFile + ":"}
				} else {
					rr = newPrefetchRows(newCSVReader(bytes.NewReader(data)), careFile+":", batchRows, batchBytes)
				}
				cells := 0
				for {
					rec, _, err := rr.next()
					if err != nil {
						if stopsFile(err) {
							break
						}
						continue
					}
					cells += len(rec)
				}
				stopRows(rr)
				if cells != 12*1_000_001 {
					b.Fatalf("%d cells", cells)
				}
			}
		})
	}
}

// setPrefetchMin sets the size from which CSV files are prefetched, and
// returns what puts it back.
func setPrefetchMin(n int64) func() {
	old := prefetchMinBytes
	prefetchMinBytes = n
	return func() { prefetchMinBytes = old }
}
