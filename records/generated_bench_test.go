package records_test

import (
	"bufio"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"testing"
	"time"

	"welfare/records"
	"welfare/records/synth"
)

// BenchmarkGenerated reads a generated folder (welfare generate --days 365
// --seed 7) at 1,000 and 10,000 animals two ways, so their ratio is measured
// in one run: csv-floor is a plain one-pass encoding/csv read of the same
// CSV files, one after the other, parsing only the first column as a date
// (what reading costs before any checking); load is records.Load,
// everything validate does. Each reports its CPU time per op too
// (cpu-ns/op, all threads and the collector): on a shared machine it is
// steadier than the wall time, which counts the other users' load.
//
//	go test ./records -run '^$' -bench 'Generated/animals=1000$/' -benchmem
func BenchmarkGenerated(b *testing.B) {
	for _, n := range []int{1000, 10000} {
		b.Run(fmt.Sprintf("animals=%d", n), func(b *testing.B) {
			dir := b.TempDir()
			if _, err := synth.Generate(dir, synth.Options{Animals: n, Days: 365, Seed: 7}); err != nil {
				b.Fatal(err)
			}
			b.Run("csv-floor", func(b *testing.B) {
				var rows int
				cpu0 := records.CPUTime()
				for b.Loop() {
					rows = csvFloor(b, dir)
				}
				b.ReportMetric(float64(records.CPUTime()-cpu0)/float64(b.N), "cpu-ns/op")
				b.ReportMetric(float64(rows)*float64(b.N)/b.Elapsed().Seconds(), "rows/s")
			})
			b.Run("load", func(b *testing.B) {
				b.ReportAllocs()
				var rows int
				cpu0 := records.CPUTime()
				for b.Loop() {
					s, err := records.Load(os.DirFS(dir), records.Options{Species: []string{"vulpes_vulpes", "vulpes_lagopus", "neogale_vison"}})
					if err != nil {
						b.Fatal(err)
					}
					rows = 0
					for _, c := range s.Accounting {
						rows += c.Read
					}
				}
				b.ReportMetric(float64(records.CPUTime()-cpu0)/float64(b.N), "cpu-ns/op")
				b.ReportMetric(float64(rows)*float64(b.N)/b.Elapsed().Seconds(), "rows/s")
			})
		})
	}
}

// csvFloor reads every record file of dir once and returns the rows read.
func csvFloor(b *testing.B, dir string) int {
	rows := 0
	var days int64
	for _, name := range records.Files {
		f, err := os.Open(filepath.Join(dir, name))
		if errors.Is(err, os.ErrNotExist) || filepath.Ext(name) != ".csv" {
			if err == nil {
				f.Close()
			}
			continue
		}
		if err != nil {
			b.Fatal(err)
		}
		r := csv.NewReader(bufio.NewReaderSize(f, 1<<16))
		r.ReuseRecord = true
		for {
			rec, err := r.Read()
			if err == io.EOF {
				break
			}
			if err != nil {
				b.Fatal(err)
			}
			rows++
			if s := rec[0]; len(s) >= 10 {
				if t, err := time.Parse(time.DateOnly, s[:10]); err == nil {
					days += t.Unix() / 86400
				}
			}
		}
		f.Close()
	}
	if days == 0 {
		b.Fatal("no dates read")
	}
	return rows
}
