package records

import (
	"bytes"
	"testing"
)

// BenchmarkPrefetch loads the 1,000,000-round folder of
// BenchmarkLoadDailyCare1M with the care file read directly and read by the
// prefetching reader, alternating in one run so the two see the same load
// of a shared machine:
//
//	go test ./records -run '^$' -bench 'Prefetch' -benchmem -count 3
func BenchmarkPrefetch(b *testing.B) {
	fsys := careFolder()
	for _, c := range []struct {
		name string
		min  int64
	}{{"direct", 1 << 62}, {"prefetch", 0}} {
		b.Run(c.name, func(b *testing.B) {
			defer setPrefetchMin(c.min)()
			b.ReportAllocs()
			cpu0 := cpuTime()
			var rows int
			for b.Loop() {
				s, err := Load(fsys, Options{Species: []string{"vulpes_vulpes"}})
				if err != nil {
					b.Fatal(err)
				}
				if len(s.Care) != 1_000_000 || len(s.Problems) != 0 {
					b.Fatalf("care rows = %d, problems = %d", len(s.Care), len(s.Problems))
				}
				rows += len(s.Care)
			}
			b.ReportMetric(float64(rows)/b.Elapsed().Seconds(), "rows/s")
			b.ReportMetric(float64(cpuTime()-cpu0)/float64(rows), "cpu-ns/row")
		})
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
					rr = &csvRows{r: newCSVReader(bytesReader(data)), base: careFile + ":"}
				} else {
					rr = newPrefetchRows(newCSVReader(bytesReader(data)), careFile+":", batchRows, batchBytes)
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

func bytesReader(b []byte) *bytes.Reader { return bytes.NewReader(b) }
