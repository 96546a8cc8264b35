package records

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"reflect"
	"runtime"
	"strconv"
	"strings"
	"sync/atomic"
	"testing"
	"testing/fstest"
	"time"
)

// readStep is everything one call of next (and span after it) gives.
type readStep struct {
	rec        string
	line       int
	start, end int
	err        string
	text       bool // every cell is text (textIssue), as the reader says or as checked here
}

// readSteps reads r to its end or the error that stops it, and twice more:
// a reader at its end keeps saying so.
func readSteps(t *testing.T, r rowReader) []readStep {
	t.Helper()
	var out []readStep
	after := 0
	for i := 0; after < 3; i++ {
		if i > 1<<20 {
			t.Fatal("the reader does not come to an end")
		}
		rec, line, err := r.next()
		st := readStep{rec: strings.Join(rec, "\x1f") + fmt.Sprintf("/%d", len(rec)), line: line}
		if sp, ok := r.(interface{ span() (int, int) }); ok {
			st.start, st.end = sp.span()
		}
		if err != nil {
			st.err = err.Error()
			if stopsFile(err) {
				after++
			}
		}
		if _, ok := r.(*prefetchRows); ok {
			st.text = textChecked(r)
		} else if err == nil {
			st.text = true
			for _, c := range rec {
				st.text = st.text && textIssue(c) == ""
			}
		}
		out = append(out, st)
	}
	return out
}

// fuzzCorpus is the byte-string inputs kept in testdata/fuzz/<target>.
func fuzzCorpus(t *testing.T, target string) [][]byte {
	t.Helper()
	files, err := filepath.Glob(filepath.Join("testdata", "fuzz", target, "*"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no corpus for %s: %v", target, err)
	}
	var out [][]byte
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		for l := range strings.Lines(string(b)) {
			lit, ok := strings.CutPrefix(strings.TrimSpace(l), "[]byte(")
			if !ok {
				continue
			}
			s, err := strconv.Unquote(strings.TrimSuffix(lit, ")"))
			if err != nil {
				t.Fatalf("%s: %v", f, err)
			}
			out = append(out, []byte(s))
		}
	}
	return out
}

// hostileCSV are inputs with every kind of row error, and rows over lines,
// placed so batch boundaries fall inside and around them.
func hostileCSV() [][]byte {
	inputs := []string{
		"", "\n\n", "a,b,c\n1,2,3\n", "a,\"b\nc\",d\r\n\n\ne,f\r", "\"a\"\"b\",c\n", "a,\"b\n", "a,b\"c\n", "\"a\"b,c\n",
		",\n,,\n", "\"\"\n\"\n\"\n", "x\r\ny\rz\n", "a,\"\r\n\"\r\n", "\ufeffa,b\n1,2",
		"a,b\ncaf\xe9,1\nok,\x00\n\xe2\x82,\xac\nfine,\u20ac\n", "a,b\n1," + strings.Repeat("y", MaxFieldBytes+1) + "\n2,3\n",
		hostileCareHead + "2026-01-15T07:00,E1,K1,yes,\"gate\nleft\"\n2026-01-15T09:00,E1,K1,yes,\"open\n2026-01-15T10:00,E1,K1,yes,ok\n",
	}
	var mixed strings.Builder
	mixed.WriteString(hostileCareHead)
	for i := range 600 {
		switch i % 9 {
		case 0:
			fmt.Fprintf(&mixed, "2026-01-15T07:00,E%d,K1,yes,\"two\nlines\"\n", i)
		case 1:
			fmt.Fprintf(&mixed, "2026-01-15T07:00,E%d,K1,yes,bare\"quote\n", i)
		case 2:
			mixed.WriteString("\n\r\n")
		case 3:
			fmt.Fprintf(&mixed, "2026-01-15T07:00,E%d,K1,\"a\"b,x\r\n", i)
		case 4:
			fmt.Fprintf(&mixed, "2026-01-15T07:00,E%d,K1,yes,\"closes\nlate\" here\n", i)
		case 5:
			fmt.Fprintf(&mixed, "2026-01-15T07:00,E%d,K1\n", i)
		default:
			fmt.Fprintf(&mixed, "2026-01-15T07:00,E%d,K1,yes,\"a, \"\"b\"\"\"\n", i)
		}
	}
	unclosed := mixed.String() + "2026-01-15T07:00,E1,K1,yes,\"never closed\n2026-01-15T08:00,E1,K1,yes,ok\n"
	tooLong := mixed.String() + strings.Repeat("x", MaxLineBytes+10) + "\nafter,it\n"
	inputs = append(inputs, mixed.String(), unclosed, tooLong)
	out := make([][]byte, len(inputs))
	for i, s := range inputs {
		out[i] = []byte(s)
	}
	return out
}

// TestPrefetchSameRows: the prefetching reader gives the rows, lines,
// spans and errors the direct reader gives, in the same order, whatever
// the batch size, on the fuzz corpora and on hostile inputs.
func TestPrefetchSameRows(t *testing.T) {
	inputs := append(fuzzCorpus(t, "FuzzCSVReader"), fuzzCorpus(t, "FuzzLoadCSV")...)
	inputs = append(inputs, hostileCSV()...)
	for i, data := range inputs {
		want := readSteps(t, &csvRows{r: newCSVReader(bytes.NewReader(data)), base: "x.csv:"})
		for _, size := range []struct{ rows, bytes int }{{1, 1 << 20}, {2, 1 << 20}, {3, 1 << 20}, {7, 1 << 20}, {64, 1 << 20}, {2048, 1}, {2048, 40}, {batchRows, batchBytes}} {
			p := newPrefetchRows(newCSVReader(bytes.NewReader(data)), "x.csv:", size.rows, size.bytes)
			got := readSteps(t, p)
			p.stop()
			if !reflect.DeepEqual(got, want) {
				for j := range min(len(got), len(want)) {
					if got[j] != want[j] {
						t.Fatalf("input %d, batches of %d rows / %d bytes, call %d: prefetch gives %+v, direct %+v", i, size.rows, size.bytes, j, got[j], want[j])
					}
				}
				t.Fatalf("input %d, batches of %d rows / %d bytes: prefetch gives %d results, direct %d", i, size.rows, size.bytes, len(got), len(want))
			}
			if p.refBase() != "x.csv:" {
				t.Fatalf("refBase %q", p.refBase())
			}
		}
	}
}

// TestPrefetchFatalInOrder: a line over the cap stops the file after the
// rows before it, and every later call says so again.
func TestPrefetchFatalInOrder(t *testing.T) {
	data := "a,b\n1,2\n3,4\n" + strings.Repeat("x", MaxLineBytes+10) + "\n5,6\n"
	p := newPrefetchRows(newCSVReader(strings.NewReader(data)), "f.csv:", 2, 1<<20)
	defer p.stop()
	for _, want := range []string{"a b 1", "1 2 2", "3 4 3"} {
		rec, line, err := p.next()
		if got := fmt.Sprintf("%s %d", strings.Join(rec, " "), line); err != nil || got != want {
			t.Fatalf("got %q, %v; want %q", got, err, want)
		}
	}
	for range 2 {
		_, _, err := p.next()
		var tl *lineTooLongError
		if !errors.As(err, &tl) || tl.line != 4 {
			t.Fatalf("err = %v, want the line-too-long error on line 4", err)
		}
	}
}

// producerEnded checks that p's goroutine has ended: it closes the channel
// as it returns.
func producerEnded(t *testing.T, p *prefetchRows) {
	t.Helper()
	select {
	case _, ok := <-p.ch:
		if !ok {
			return
		}
	default:
	}
	t.Fatal("the prefetching goroutine has not ended when stop returns")
}

// goroutinesBackTo waits until the goroutine count is back to n.
func goroutinesBackTo(t *testing.T, n int) {
	t.Helper()
	for i := 0; runtime.NumGoroutine() > n; i++ {
		if i == 2000 {
			buf := make([]byte, 1<<16)
			t.Fatalf("%d goroutines, %d before:\n%s", runtime.NumGoroutine(), n, buf[:runtime.Stack(buf, true)])
		}
		time.Sleep(10 * time.Millisecond)
	}
}

// countingReader is a CSV source of rows rows, counting the bytes read.
type countingReader struct {
	rows, n int
	read    atomic.Int64
	pending []byte
}

func (c *countingReader) Read(p []byte) (int, error) {
	for len(c.pending) < len(p) && c.n < c.rows {
		c.pending = fmt.Appendf(c.pending, "2026-01-15T07:00,E%d,K1,yes,ok\n", c.n)
		c.n++
	}
	if len(c.pending) == 0 {
		return 0, io.EOF
	}
	n := copy(p, c.pending)
	c.pending = c.pending[n:]
	c.read.Add(int64(n))
	return n, nil
}

// TestPrefetchStopsEarly: a loader that stops before the end of the file
// ends the goroutine, which has read only a bounded way ahead.
func TestPrefetchStopsEarly(t *testing.T) {
	before := runtime.NumGoroutine()
	src := &countingReader{rows: 1 << 20} // about 32 MB
	p := newPrefetchRows(newCSVReader(src), "f.csv:", 1<<20, 4<<10)
	if _, _, err := p.next(); err != nil {
		t.Fatal(err)
	}
	// Let the producer go as far ahead as it will: it blocks once its
	// batches are all full.
	for last, i := int64(-1), 0; i < 100; i++ {
		time.Sleep(50 * time.Millisecond)
		if n := src.read.Load(); n != last {
			last = n
			continue
		}
		break
	}
	p.stop()
	producerEnded(t, p)
	// The csvReader's buffer and three batches (one being filled, one
	// waiting, one in the loader's hands), each at most one row over its cap.
	if read, limit := src.read.Load(), int64(64<<10+3*(4<<10+64)); read > limit {
		t.Errorf("read %d bytes ahead of a loader at its first row; the bound is %d", read, limit)
	}
	if _, _, err := p.next(); !errors.Is(err, errRowsStopped) {
		t.Errorf("next after stop: %v, want %v", err, errRowsStopped)
	}
	p.stop() // twice is harmless
	goroutinesBackTo(t, before)

	// Stopped before any row is read.
	q := newPrefetchRows(newCSVReader(&countingReader{rows: 1 << 20}), "f.csv:", 16, 1<<20)
	q.stop()
	producerEnded(t, q)
	goroutinesBackTo(t, before)
}

// forcePrefetch makes every CSV file read by the prefetching reader, in
// batches of rows rows, its batches poisoned once read (so a cell the
// loader keeps without copying shows), until the returned function puts
// it back.
func forcePrefetch(rows, bytes int) func() {
	oldMin, oldRows, oldBytes, oldPoison := prefetchMinBytes, batchRows, batchBytes, poisonCells
	prefetchMinBytes, batchRows, batchBytes, poisonCells = 0, rows, bytes, true
	return func() { prefetchMinBytes, batchRows, batchBytes, poisonCells = oldMin, oldRows, oldBytes, oldPoison }
}

// TestPrefetchSameSet: loading the FuzzLoadCSV corpus gives the same set,
// problems and accounting with every file prefetched as read directly.
func TestPrefetchSameSet(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("testdata", "fuzz", "FuzzLoadCSV", "*"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no corpus: %v", err)
	}
	opt := testSpecies
	opt.Now = fuzzNow
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		var which int
		var data []byte
		for l := range strings.Lines(string(b)) {
			l = strings.TrimSpace(l)
			if lit, ok := strings.CutPrefix(l, "byte("); ok {
				c, _, _, err := strconv.UnquoteChar(strings.Trim(strings.TrimSuffix(lit, ")"), "'"), '\'')
				if err != nil {
					t.Fatalf("%s: %v", f, err)
				}
				which = int(c)
			}
			if lit, ok := strings.CutPrefix(l, "[]byte("); ok {
				s, err := strconv.Unquote(strings.TrimSuffix(lit, ")"))
				if err != nil {
					t.Fatalf("%s: %v", f, err)
				}
				data = []byte(s)
			}
		}
		fsys := folder(nil)
		fsys[fuzzFiles[which%len(fuzzFiles)]] = &fstest.MapFile{Data: data}
		load := func() (*Set, string) {
			s, err := Load(fsys, opt)
			return s, fmt.Sprint(err)
		}
		want, wantErr := load()
		for _, rows := range []int{1, 3, batchRows} {
			restore := forcePrefetch(rows, 1<<20)
			got, gotErr := load()
			restore()
			if gotErr != wantErr || !reflect.DeepEqual(got, want) {
				t.Errorf("%s, batches of %d rows: prefetched load differs (err %s, direct %s)", filepath.Base(f), rows, gotErr, wantErr)
			}
		}
	}
}

// TestPrefetchLoaderTests runs the loader's tests of hostile and malformed
// input again with every CSV file prefetched, in batches of one row, of
// three, and of the usual size: their messages, lines and counts must not
// change.
func TestPrefetchLoaderTests(t *testing.T) {
	tests := loaderTests()
	before := runtime.NumGoroutine()
	for _, rows := range []int{1, 3, batchRows} {
		restore := forcePrefetch(rows, 1<<20)
		for name, test := range tests {
			t.Run(fmt.Sprintf("%s/rows=%d", name, rows), test)
		}
		restore()
	}
	goroutinesBackTo(t, before)
}

// TestPrefetchCancel: a cancelled load of a file that never ends leaves no
// prefetching goroutine behind.
func TestPrefetchCancel(t *testing.T) {
	defer forcePrefetch(4, 1<<20)()
	before := runtime.NumGoroutine()
	fsys := endless{folder(map[string]string{careFile: hostileCareHead})}
	ctx, cancel := context.WithCancel(context.Background())
	time.AfterFunc(100*time.Millisecond, cancel)
	if _, err := LoadContext(ctx, fsys, testSpecies); !errors.Is(err, context.Canceled) {
		t.Fatalf("err = %v, want context.Canceled", err)
	}
	goroutinesBackTo(t, before)
}

// TestPrefetchChosenBySize: only a file of prefetchMinBytes or more is
// prefetched.
func TestPrefetchChosenBySize(t *testing.T) {
	small := fstest.MapFS{"a.csv": {Data: []byte("a\n1\n")}}
	big := fstest.MapFS{"a.csv": {Data: bytes.Repeat([]byte("1\n"), int(prefetchMinBytes/2))}}
	for _, c := range []struct {
		fsys     fstest.MapFS
		prefetch bool
	}{{small, false}, {big, true}} {
		f, err := OpenFile(context.Background(), c.fsys, "a.csv")
		if err != nil {
			t.Fatal(err)
		}
		r := newCSVRows(f, f, "a.csv")
		if _, ok := r.(*prefetchRows); ok != c.prefetch {
			t.Errorf("%d bytes: prefetched %v, want %v", len(c.fsys["a.csv"].Data), ok, c.prefetch)
		}
		stopRows(r)
		f.Close()
	}
}

// TestPrefetchCellsReused: a row's cells are views of its batch's text,
// right when read however the batches before were reused; the text is
// reused (a kept cell is the loader's to copy), and poisoned in tests.
func TestPrefetchCellsReused(t *testing.T) {
	defer func(v bool) { poisonCells = v }(poisonCells)
	poisonCells = true
	var data strings.Builder
	for i := range 5000 {
		fmt.Fprintf(&data, "r%d,\"c,%d\",x%d\n", i, i*7, i%13)
	}
	p := newPrefetchRows(newCSVReader(strings.NewReader(data.String())), "f.csv:", 16, 1<<20)
	defer p.stop()
	var first []string
	for i := 0; ; i++ {
		rec, _, err := p.next()
		if err != nil {
			break
		}
		if got, want := strings.Join(rec, "|"), fmt.Sprintf("r%d|c,%d|x%d", i, i*7, i%13); got != want {
			t.Fatalf("row %d read as %q, want %q", i+1, got, want)
		}
		if i == 0 {
			first = rec[:3:3]
		}
	}
	if got := strings.Join(first, "|"); got == "r0|c,0|x0" {
		t.Errorf("the first row's cells are intact after every batch: the text was not reused or not poisoned")
	}
}

// FuzzRowText: csvReader.rowText, the one-pass check of a record, agrees
// with textIssue on each of its cells for any input.
func FuzzRowText(f *testing.F) {
	for _, s := range []string{"a,b\n", "\xe2\x82,\xac\n", "caf\xe9,1\n", "ok,\x00\n", "\u20ac,\"\xe2\x82\"\"\xac\"\n", "a," + strings.Repeat("y", MaxFieldBytes+1) + "\n"} {
		f.Add([]byte(s))
	}
	f.Fuzz(func(t *testing.T, data []byte) {
		r := newCSVReader(bytes.NewReader(data))
		for {
			rec, err := r.Read()
			if err != nil {
				if stopsFile(err) {
					return
				}
				continue
			}
			want := true
			for _, c := range rec {
				want = want && textIssue(c) == ""
			}
			if got := r.rowText(); got != want {
				t.Fatalf("record %q: rowText %v, cell by cell %v", rec, got, want)
			}
		}
	})
}

// TestPrefetchRowsOverBatchText: rows whose text does not fit what is left
// of a batch's buffer (cells of up to 60 KiB after rows of a few bytes)
// are read as the direct reader reads them, and stay right while the
// batches are reused.
func TestPrefetchRowsOverBatchText(t *testing.T) {
	defer func(v bool) { poisonCells = v }(poisonCells)
	poisonCells = true
	var data strings.Builder
	for i := range 400 {
		if i%7 == 3 {
			fmt.Fprintf(&data, "r%d,%s,\"%s\"\n", i, strings.Repeat("w", 60<<10), strings.Repeat("q", i*50))
			continue
		}
		fmt.Fprintf(&data, "r%d,s,%d\n", i, i)
	}
	want := readSteps(t, &csvRows{r: newCSVReader(strings.NewReader(data.String())), base: "x.csv:"})
	for _, rows := range []int{1, 5, 64, batchRows} {
		p := newPrefetchRows(newCSVReader(strings.NewReader(data.String())), "x.csv:", rows, batchBytes)
		got := readSteps(t, p)
		p.stop()
		if !reflect.DeepEqual(got, want) {
			t.Fatalf("batches of %d rows: the prefetched rows differ from the direct ones", rows)
		}
	}
}

// loaderTests are the loader's tests of hostile and malformed input, which
// TestPrefetchLoaderTests and TestSplitLoaderTests run again with every
// file read the other ways: one list, so a test added to the loader is
// run all three ways.
func loaderTests() map[string]func(*testing.T) {
	return map[string]func(*testing.T){
		"RefusedEntries": TestRefusedEntries, "RequiredRefused": TestRequiredRefused, "OSFolder": TestOSFolder,
		"LineCap": TestLineCap, "FieldCap": TestFieldCap, "LongValueEchoShortened": TestLongValueEchoShortened,
		"FileSize": TestFileSize, "CappedReader": TestCappedReader, "LoadCancel": TestLoadCancel,
		"TextCells": TestTextCells, "HeaderNotText": TestHeaderNotText, "UnclosedQuote": TestUnclosedQuote,
		"QuoteStillOpen": TestQuoteStillOpen, "DateWindow": TestDateWindow, "WarningsGrouped": TestWarningsGrouped,
		"LoadBase": TestLoadBase, "RowProblems": TestRowProblems, "ColdPlausibility": TestColdPlausibility,
		"UnitColumns": TestUnitColumns, "CSVForms": TestCSVForms, "FileLevel": TestFileLevel,
		"CrossRecord": TestCrossRecord, "CareRoundTimes": TestCareRoundTimes, "SpeciesNotChecked": TestSpeciesNotChecked,
		"LoadErrors": TestLoadErrors, "ProblemDayAndValue": TestProblemDayAndValue, "ShortQuote": TestShortQuote,
	}
}
