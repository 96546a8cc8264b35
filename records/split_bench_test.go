package records

import (
	"bytes"
	"maps"
	"testing"
	"testing/fstest"
)

// BenchmarkSplitNoteAtCut1M loads the million care rounds of
// BenchmarkLoadDailyCare1M (about 70 MB, read in two ranges) with one round's
// note holding a line break where the two ranges are cut:
//
//   - plain: no such note (the ranges join as cut);
//   - note-2-lines: "gate\nleft open", its newline the first after the
//     middle: the cut moves to the next quiet newline (splitPoints);
//   - note-6-lines: a note of six lines, which the cut still falls inside:
//     the range before it stops at the note's row and the rest of the file
//     is read again from there (readSpans);
//   - sequential: the plain file read whole by one reader, for scale.
//
// Compare ns/op, cpu-ns/row and B/op with plain. On 2 shared cores
// (median of 3): plain 220 ms, 424 cpu-ns/row, 53 MB/op; note-2-lines the
// same; note-6-lines 327 ms, 627 cpu-ns/row, 81 MB/op (the range after the
// cut is read in vain, and half the file again); sequential 303 ms. Before
// the rest was read from the open row, a cut inside a note read the whole
// file again after the ranges. Peak resident memory through the binary:
// testdata/split_fallback.sh.
func BenchmarkSplitNoteAtCut1M(b *testing.B) {
	base := careFolder()
	for _, c := range []struct {
		name    string
		note    string
		resumes int
		whole   bool
	}{
		{"plain", "", 0, false},
		{"note-2-lines", "gate\nleft open", 0, false},
		{"note-6-lines", "gate\nleft\nopen\nby\nthe\nkeeper", 1, false},
		{"sequential", "", 0, true},
	} {
		b.Run(c.name, func(b *testing.B) {
			fsys := maps.Clone(base)
			if c.note != "" {
				fsys[careFile] = &fstest.MapFile{Data: noteAtHalf(base[careFile].Data, c.note)}
			}
			// Two ranges whatever the cores, so the cut is at the middle.
			ranges := 2
			if c.whole {
				ranges = 1
			}
			defer splitInto(ranges)()
			resumed := 0
			splitResumed = func(int64, int) { resumed++ }
			defer func() { splitResumed = nil }()
			b.ReportAllocs()
			b.ResetTimer()
			cpu0 := cpuTime()
			var rows int
			for b.Loop() {
				resumed = 0
				s, err := Load(fsys, Options{Species: []string{"vulpes_vulpes"}})
				if err != nil {
					b.Fatal(err)
				}
				if s.CareRounds().Len() != 1_000_000 || len(s.Problems) != 0 || resumed != c.resumes {
					b.Fatalf("care rows = %d, problems = %d, resumed %d times, want %d", s.CareRounds().Len(), len(s.Problems), resumed, c.resumes)
				}
				rows += s.CareRounds().Len()
			}
			b.ReportMetric(float64(rows)/b.Elapsed().Seconds(), "rows/s")
			b.ReportMetric(float64(cpuTime()-cpu0)/float64(rows), "cpu-ns/row")
		})
	}
}

// noteAtHalf puts note, quoted, as the last cell (notes, empty in every
// row) of the row where half the edited file falls: the note's first
// newline is then the first newline at or after half its size.
func noteAtHalf(data []byte, note string) []byte {
	cell := []byte(`"` + note + `"`)
	at := (len(data) + len(cell)) / 2
	end := at + bytes.IndexByte(data[at:], '\n')
	out := make([]byte, 0, len(data)+len(cell))
	out = append(out, data[:end]...)
	out = append(out, cell...)
	return append(out, data[end:]...)
}
