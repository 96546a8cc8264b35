package records

import (
	"bytes"
	"context"
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"runtime"
	"strconv"
	"strings"
	"testing"
	"testing/fstest"
	"time"
)

// forceSplit makes every CSV file without a unique id read in ranges cut
// just after the first newline at or after each of targets (nil: n equal
// parts), with the readers' cells poisoned once read (so a cell the
// loader keeps without copying shows), until the returned function puts
// it back.
func forceSplit(n int, targets []int64) func() {
	oldMin, oldN, oldTargets, oldPoison := splitMinBytes, splitRanges, splitTargets, poisonCells
	splitMinBytes, splitRanges, poisonCells = 0, n, true
	splitTargets = nil
	if targets != nil {
		splitTargets = func(int64, int64, int) []int64 { return targets }
	}
	return func() { splitMinBytes, splitRanges, splitTargets, poisonCells = oldMin, oldN, oldTargets, oldPoison }
}

// noSplit reads every file sequentially until the returned function puts
// it back.
func noSplit() func() { return splitInto(1) }

// splitInto reads each large file in n ranges, whatever the cores, until
// the returned function puts it back.
func splitInto(n int) func() {
	old := splitRanges
	splitRanges = n
	return func() { splitRanges = old }
}

// splitJoins reports whether the file name of fsys, read in ranges cut at
// targets, joins (rather than falling back to the sequential reader), and
// that the file so read is the file read sequentially.
func splitJoins(t *testing.T, fsys fstest.MapFS, name string, targets []int64) bool {
	t.Helper()
	loc, _ := time.LoadLocation("America/Winnipeg")
	e := &env{loc: loc, sources: map[string]*source{name: {file: name, display: name}}, window: dateWindow(fuzzNow, loc)}
	switch name {
	case careFile:
		return joinsAsRead(t, fsys, careSpec, e, targets)
	case handlingFile:
		return joinsAsRead(t, fsys, handlingSpec, e, targets)
	case observationsFile:
		return joinsAsRead(t, fsys, observationSpec, e, targets)
	}
	t.Fatalf("no spec for %s", name)
	return false
}

func joinsAsRead[T any](t *testing.T, fsys fstest.MapFS, spec *fileSpec[T], e *env, targets []int64) bool {
	t.Helper()
	restore := noSplit()
	want := loadFile(context.Background(), fsys, spec, e)
	restore()
	defer forceSplit(len(targets)+1, targets)()
	got := loadSplit(context.Background(), fsys, spec, e, e.sources[spec.name])
	if got == nil {
		return false
	}
	if !reflect.DeepEqual(got, want) {
		t.Errorf("cut at %v: the file read in ranges differs from the file read whole\nranges: %+v %v\nwhole:  %+v %v",
			targets, got.count, got.problems, want.count, want.problems)
	}
	return true
}

// sameSplitLoad loads fsys whole and in ranges cut at targets and fails
// unless the sets (and errors) are the same.
func sameSplitLoad(t *testing.T, fsys fstest.MapFS, targets []int64, what string) {
	t.Helper()
	opt := testSpecies
	opt.Now = fuzzNow
	restore := noSplit()
	want, wantErr := Load(fsys, opt)
	restore()
	restore = forceSplit(len(targets)+1, targets)
	got, gotErr := Load(fsys, opt)
	restore()
	if fmt.Sprint(gotErr) != fmt.Sprint(wantErr) || !reflect.DeepEqual(got, want) {
		t.Errorf("%s, cut at %v: loaded in ranges differs from loaded whole (err %v, whole %v)", what, targets, gotErr, wantErr)
		if got != nil && want != nil {
			t.Errorf("ranges: %v\n%v\nwhole:  %v\n%v", got.Accounting, problemLines(got), want.Accounting, problemLines(want))
		}
	}
}

// newlines are the offsets of data's newlines, at most max of them spread
// over the file.
func newlines(data []byte, max int) []int64 {
	var out []int64
	for i, b := range data {
		if b == '\n' {
			out = append(out, int64(i))
		}
	}
	if len(out) > max {
		step := (len(out) + max - 1) / max
		var some []int64
		for i := 0; i < len(out); i += step {
			some = append(some, out[i])
		}
		out = some
	}
	return out
}

// splitInputs are care round files with every kind of row error, quoted
// cells (commas, quotes, newlines in them), CRLF, a byte order mark, blank
// lines and a local column, and rows rejected around every cut.
func splitInputs() map[string]string {
	head := "checked_at,enclosure_id,staff_id,observed,water,notes,x_tag\n"
	var b strings.Builder
	b.WriteString(head)
	for i := range 120 {
		switch i % 12 {
		case 0:
			fmt.Fprintf(&b, "2026-01-15T07:%02d,E1,K1,yes,ok,\"two\nlines\",t%d\n", i%60, i)
		case 1:
			fmt.Fprintf(&b, "2026-01-15T07:%02d,E1,K1,yes,ok,bare\"quote,\n", i%60)
		case 2:
			b.WriteString("\n\r\n")
		case 3:
			fmt.Fprintf(&b, "2026-01-15T07:%02d,E2,K1,\"a\"b,x,,\r\n", i%60)
		case 4:
			fmt.Fprintf(&b, "2026-01-15T07:%02d,E1,K1,yes,ok,\"closes\nlate\" here,\n", i%60)
		case 5:
			fmt.Fprintf(&b, "2026-01-15T07:%02d,E1,K1\n", i%60)
		case 6:
			fmt.Fprintf(&b, "2026-01-15T07:%02d,E9,K1,yes,ok,unknown enclosure,\n", i%60)
		case 7:
			fmt.Fprintf(&b, "2026-13-15T07:%02d,E1,K1,yes,ok,,\n", i%60)
		case 8:
			fmt.Fprintf(&b, "2026-01-15T07:%02d,E2,V1,no,frozn,\"a, \"\"b\"\"\",\r\n", i%60)
		default:
			fmt.Fprintf(&b, "2026-01-%02dT08:%02d,E%d,K1,yes,low,note %d,x%d\n", 1+i%28, i%60, 1+i%2, i%7, i)
		}
	}
	mixed := b.String()
	var plain strings.Builder
	plain.WriteString("checked_at,enclosure_id,staff_id,observed,fed,water\r\n")
	for i := range 200 {
		fmt.Fprintf(&plain, "2026-01-%02dT07:30,E%d,K1,yes,y,ok\r\n", 1+i%28, 1+i%2)
	}
	return map[string]string{
		"mixed":    mixed,
		"bom":      "\ufeff" + mixed,
		"crlf":     plain.String(),
		"unclosed": mixed + "2026-01-15T07:00,E1,K1,yes,ok,\"never closed\n2026-01-15T08:00,E1,K1,yes,ok,,\n",
		"no-final": strings.TrimSuffix(plain.String(), "\r\n") + "\r",
		"long-quote": head + "2026-01-15T07:00,E1,K1,yes,ok,\"" + strings.Repeat("line\n", 40) + "end\",\n" +
			"2026-01-15T08:00,E1,K1,yes,ok,,\n",
	}
}

// TestSplitSameSet: a care round file read in two ranges, cut after each
// of its newlines, and in three, loads the very set (rows, refs, store and
// its table of strings, problems and their order, counts) that reading it
// whole loads; whether the ranges joined or fell back. Cuts after a
// newline that ends a record must join.
func TestSplitSameSet(t *testing.T) {
	for name, data := range splitInputs() {
		fsys := folder(map[string]string{careFile: data})
		nl := newlines([]byte(data), 150)
		joined := 0
		for i, p := range nl {
			sameSplitLoad(t, fsys, []int64{p}, name)
			if splitJoins(t, fsys, careFile, []int64{p}) {
				joined++
			}
			if i%5 == 0 {
				// Each range prefetched in batches of two rows, poisoned once read.
				restore := forcePrefetch(2, 1<<20)
				sameSplitLoad(t, fsys, []int64{p}, name+" prefetched")
				restore()
			}
		}
		for i := 0; i+2 < len(nl); i += 7 {
			targets := []int64{nl[i], nl[i+2]}
			sameSplitLoad(t, fsys, targets, name)
			splitJoins(t, fsys, careFile, targets)
		}
		if joined == 0 {
			t.Errorf("%s: no cut joined: the ranges were never used", name)
		}
	}
}

// TestSplitQuotedNewline: a cut just after a newline inside a quoted cell
// is seen (the first range ends inside the quote) and the rest of the file
// is read again from the row where the quote opened; a cut after the line
// where that quote closes joins as cut.
func TestSplitQuotedNewline(t *testing.T) {
	head := "checked_at,enclosure_id,staff_id,observed,notes\n"
	rows := head + "2026-01-15T07:00,E1,K1,yes,ok\n" +
		"2026-01-15T08:00,E1,K1,yes,\"gate\nleft open\"\n" +
		"2026-01-15T09:00,E2,K1,yes,fine\n"
	fsys := folder(map[string]string{careFile: rows})
	inQuote := int64(strings.Index(rows, "gate\n") + len("gate"))
	afterQuote := int64(strings.Index(rows, "open\"\n") + len("open\""))
	openRow := int64(strings.Index(rows, "2026-01-15T08:00"))
	if got := resumes(t, fsys, []int64{inQuote}); !reflect.DeepEqual(got, []resume{{openRow, 3}}) {
		t.Errorf("a cut inside a quoted cell resumed at %v, want offset %d, line 3", got, openRow)
	}
	if got := resumes(t, fsys, []int64{afterQuote}); len(got) != 0 {
		t.Errorf("a cut after the quote closed resumed at %v", got)
	}
	sameSplitLoad(t, fsys, []int64{inQuote}, "quoted newline")
	s := mustLoadSplit(t, fsys, []int64{inQuote})
	if n := s.CareRounds().Len(); n != 3 {
		t.Errorf("%d rounds, want 3", n)
	}
	if got := s.CareRounds().Round(1).Notes; got != "gate\nleft open" {
		t.Errorf("notes %q, want the quoted cell with its newline", got)
	}
	// The same with a quote that never closes before the cut, and a row
	// after it rejected for it.
	bad := head + "2026-01-15T07:00,E1,K1,yes,\"open\nstill\n2026-01-15T09:00,E2,K1,yes,x\n"
	fsys = folder(map[string]string{careFile: bad})
	for _, p := range newlines([]byte(bad), 100) {
		sameSplitLoad(t, fsys, []int64{p}, "open quote")
	}
	openRow = int64(len(head))
	if got := resumes(t, fsys, []int64{int64(strings.Index(bad, "open\n") + 4)}); !reflect.DeepEqual(got, []resume{{openRow, 2}}) {
		t.Errorf("a cut inside a quote that never closes resumed at %v, want offset %d, line 2", got, openRow)
	}
}

type resume struct {
	off  int64
	line int
}

// resumes reads the care rounds of fsys in ranges cut at targets, fails
// unless they are the rounds read whole, and returns where the rest of
// the file was read again from, in order.
func resumes(t *testing.T, fsys fstest.MapFS, targets []int64) []resume {
	t.Helper()
	var got []resume
	splitResumed = func(off int64, line int) { got = append(got, resume{off, line}) }
	defer func() { splitResumed = nil }()
	if !splitJoins(t, fsys, careFile, targets) {
		t.Errorf("cut at %v: the ranges fell back to the sequential reader", targets)
	}
	return got
}

// TestSplitResume: care rounds with quoted cells over two to six lines,
// read in two to four ranges cut at every pair of newlines, load the set
// read whole; each time a range ends inside a quote, the rest is read from
// the first line of a row that opens a quote, and every cut inside a
// quote is resumed from.
func TestSplitResume(t *testing.T) {
	var b strings.Builder
	b.WriteString("checked_at,enclosure_id,staff_id,observed,notes,x_tag\n")
	for i := range 60 {
		switch i % 10 {
		case 3:
			fmt.Fprintf(&b, "2026-01-%02dT07:00,E1,K1,yes,\"%s\",t%d\n", 1+i%28, strings.Repeat("line\n", i%6)+"end", i)
		case 7:
			fmt.Fprintf(&b, "2026-01-%02dT07:00,E9,K1,yes,\"bad\nrow\",\"two\nquotes\"\n", 1+i%28)
		default:
			fmt.Fprintf(&b, "2026-01-%02dT08:00,E%d,K1,yes,note %d,\n", 1+i%28, 1+i%2, i)
		}
	}
	data := b.String()
	fsys := folder(map[string]string{careFile: data})
	inQuote := func(off int64) bool { return strings.Count(data[:off], "\"")%2 == 1 }
	nl := newlines([]byte(data), 1<<20)
	resumed := 0
	for i, p := range nl[1 : len(nl)-1] {
		cuts := [][]int64{{p}}
		for k := i + 2; k < len(nl)-1; k += 5 {
			cuts = append(cuts, []int64{p, nl[k]})
		}
		for _, targets := range cuts {
			q := targets[len(targets)-1]
			got := resumes(t, fsys, targets)
			if inQuote(p+1) && (len(got) == 0 || got[0].off > p) {
				t.Errorf("cut at %v inside a quote: resumed at %v", targets, got)
			}
			for _, r := range got {
				line := data[r.off:]
				line = line[:strings.IndexByte(line, '\n')]
				if data[r.off-1] != '\n' || strings.Count(data[:r.off], "\n")+1 != r.line || !strings.Contains(line, "\"") {
					t.Errorf("cut at %v: resumed at %d, line %d (%q), not the start of a row opening a quote", targets, r.off, r.line, line)
				}
			}
			resumed += len(got)
			if len(targets) == 2 && q-p < 60 {
				sameSplitLoad(t, fsys, append(targets, q+(int64(len(data))-q)/2), "three cuts")
			}
		}
	}
	if resumed == 0 {
		t.Errorf("no cut resumed")
	}
	// The rest read in ranges again, cut as a file is (equal parts, here
	// of two to four ranges), each time a range ends inside a quote: up
	// to maxResumes times, then as one range.
	opt := testSpecies
	opt.Now = fuzzNow
	restore := noSplit()
	want, wantErr := Load(fsys, opt)
	restore()
	for n := 2; n <= 4; n++ {
		deep := 0
		for _, p := range nl[1 : len(nl)-1] {
			restore := forceSplit(n, nil)
			splitTargets = func(from, size int64, n int) []int64 {
				if from == 0 {
					return []int64{p}
				}
				var out []int64
				for k := 1; k < n; k++ {
					out = append(out, from+(size-from)*int64(k)/int64(n))
				}
				return out
			}
			var got []resume
			splitResumed = func(off int64, line int) { got = append(got, resume{off, line}) }
			set, err := Load(fsys, opt)
			splitResumed = nil
			restore()
			if fmt.Sprint(err) != fmt.Sprint(wantErr) || !reflect.DeepEqual(set, want) {
				t.Errorf("%d ranges, first cut at %d, resumed at %v: loaded in ranges differs from loaded whole", n, p, got)
			}
			if len(got) > maxResumes+1 {
				t.Errorf("%d ranges, first cut at %d: resumed %d times", n, p, len(got))
			}
			for i := 1; i < len(got); i++ {
				if got[i].off <= got[i-1].off {
					t.Errorf("%d ranges, first cut at %d: resumed at %v, not on", n, p, got)
				}
			}
			if len(got) > 1 {
				deep++
			}
		}
		if deep == 0 {
			t.Errorf("%d ranges: the rest never resumed again", n)
		}
	}
}

// TestLineStart: the start of every line of a range, looked for from its
// end, is the offset just after the newline before it.
func TestLineStart(t *testing.T) {
	data := "head\n\nab\r\n" + strings.Repeat("x", 70000) + "\nc\n\"d\ne\"\n"
	ra := strings.NewReader(data)
	nl := newlines([]byte(data), 1<<20)
	for i := range nl {
		for j := i + 1; j < len(nl); j++ {
			from, to := nl[i]+1, nl[j]+1
			last := j + 1 // line numbers from 1: the newline nl[j] ends line j+1
			for line := i + 2; line <= last; line++ {
				got, err := lineStart(context.Background(), ra, from, to, last, line)
				if want := nl[line-2] + 1; err != nil || got != want {
					t.Errorf("[%d, %d) line %d: %d (%v), want %d", from, to, line, got, err, want)
				}
			}
			if _, err := lineStart(context.Background(), ra, from, to, last, i+1); err == nil {
				t.Errorf("[%d, %d): line %d, before the range, found", from, to, i+1)
			}
		}
	}
}

func mustLoadSplit(t *testing.T, fsys fstest.MapFS, targets []int64) *Set {
	t.Helper()
	defer forceSplit(len(targets)+1, targets)()
	return mustLoad(t, fsys)
}

// TestSplitRowsFile: a file kept as rows (not in a store) joins its blocks
// of rows in order, refs and problems included.
func TestSplitRowsFile(t *testing.T) {
	var b strings.Builder
	b.WriteString("animal_id,staff_id,handled_at,purpose,duration_min\n")
	for i := range 3000 {
		switch i % 500 {
		case 17:
			fmt.Fprintf(&b, "A%d,K1,2026-01-15T07:00,bad purpose,30\n", 1+i%2)
		case 18:
			fmt.Fprintf(&b, "A9,K1,2026-01-15T07:00,weighing,30\n")
		default:
			fmt.Fprintf(&b, "A%d,K1,2026-01-%02dT07:00,weighing,%d\n", 1+i%2, 1+i%28, 10+i%50)
		}
	}
	data := b.String()
	fsys := folder(map[string]string{handlingFile: data})
	for _, p := range newlines([]byte(data), 40) {
		sameSplitLoad(t, fsys, []int64{p}, "handling")
		if !splitJoins(t, fsys, handlingFile, []int64{p}) {
			t.Fatalf("cut at %d fell back", p)
		}
	}
	restore := forceSplit(3, nil)
	s := mustLoad(t, fsys)
	restore()
	if len(s.Handling) < 2900 || s.Handling[len(s.Handling)-1].Ref != Ref("handling.csv:3001") {
		t.Errorf("%d handling rows, the last %s", len(s.Handling), s.Handling[len(s.Handling)-1].Ref)
	}
}

// TestSplitCorpora loads the FuzzLoadCSV corpus and the hostile inputs
// read in ranges at many cuts, with and without prefetching: the sets are
// those read whole.
func TestSplitCorpora(t *testing.T) {
	type input struct {
		name string
		data []byte
	}
	var inputs []input
	for _, c := range loadCorpus(t) {
		if name := fuzzFiles[c.which%len(fuzzFiles)]; name == careFile || name == handlingFile {
			inputs = append(inputs, input{name, c.data})
		}
	}
	for _, data := range hostileCSV() {
		inputs = append(inputs, input{careFile, data})
	}
	for _, in := range inputs {
		fsys := folder(nil)
		fsys[in.name] = &fstest.MapFile{Data: in.data}
		for i, p := range newlines(in.data, 12) {
			sameSplitLoad(t, fsys, []int64{p}, in.name)
			if i%3 == 0 {
				restore := forcePrefetch(3, 1<<20)
				sameSplitLoad(t, fsys, []int64{p}, in.name+" prefetched")
				restore()
			}
		}
	}
}

// TestSplitLoaderTests runs the loader's tests of hostile and malformed
// input again with every file without unique ids read in two and three
// ranges: their messages, lines and counts must not change, and no
// goroutine is left behind.
func TestSplitLoaderTests(t *testing.T) {
	tests := loaderTests()
	before := runtime.NumGoroutine()
	for _, n := range []int{2, 3} {
		restore := forceSplit(n, nil)
		for name, test := range tests {
			t.Run(fmt.Sprintf("%s/ranges=%d", name, n), test)
		}
		restore()
	}
	goroutinesBackTo(t, before)
}

// TestSplitPoints: cuts fall just after a newline, in order, inside the
// file; a line longer than the search leaves the rest in one range.
func TestSplitPoints(t *testing.T) {
	data := []byte("head\n" + strings.Repeat("a,b\n", 100))
	cuts := splitPoints(context.Background(), bytes.NewReader(data), 0, int64(len(data)), 4)
	if len(cuts) != 5 || cuts[0] != 0 || cuts[4] != int64(len(data)) {
		t.Fatalf("cuts %v", cuts)
	}
	for _, c := range cuts[1:4] {
		if data[c-1] != '\n' {
			t.Errorf("cut %d is not after a newline", c)
		}
	}
	// Notes over two and three lines, quotes doubled inside them, on every
	// third row: no cut falls inside a quote. One over four lines can be
	// cut inside.
	for _, note := range []string{"\"a\nb\"", "\"a \"\"b\"\"\nc\"", "\"a\nb\nc\"", "\"\"\"a\"\"\n\n\"\"c\"\"\""} {
		var b strings.Builder
		b.WriteString("head,notes\n")
		for i := range 400 {
			if i%3 == 0 {
				fmt.Fprintf(&b, "%d,%s\n", i, note)
			} else {
				fmt.Fprintf(&b, "%d,\"plain, quoted\"\n", i)
			}
		}
		data := []byte(b.String())
		for n := 2; n <= 8; n++ {
			cuts := splitPoints(context.Background(), bytes.NewReader(data), 0, int64(len(data)), n)
			if len(cuts) != n+1 {
				t.Errorf("%q, %d ranges: cuts %v", note, n, cuts)
			}
			for _, c := range cuts[1 : len(cuts)-1] {
				if data[c-1] != '\n' || bytes.Count(data[:c], []byte{'"'})%2 != 0 {
					t.Errorf("%q, %d ranges: cut %d inside a quote", note, n, c)
				}
			}
		}
	}
	var four strings.Builder
	four.WriteString("head,notes\n")
	for i := range 400 {
		fmt.Fprintf(&four, "%d,\"a\nb\nc\nd\"\n", i)
	}
	inside := 0
	for n := 2; n <= 8; n++ {
		data := []byte(four.String())
		for _, c := range splitPoints(context.Background(), bytes.NewReader(data), 0, int64(len(data)), n) {
			if bytes.Count(data[:c], []byte{'"'})%2 != 0 {
				inside++
			}
		}
	}
	if inside == 0 {
		t.Errorf("no cut fell inside a note of four lines: is the search looking further than a line each side?")
	}
	long := []byte("head\n" + strings.Repeat("x", 3*splitSearch) + "\nrow\n")
	if cuts := splitPoints(context.Background(), bytes.NewReader(long), 0, int64(len(long)), 2); len(cuts) != 2 {
		t.Errorf("a line over the search was cut: %v", cuts)
	}
}

// TestSplitStoreKeys: the care rounds read in ranges have the table of
// strings (keys included) the sequential store has, so Keys and Strings
// agree with it.
func TestSplitStoreKeys(t *testing.T) {
	var b strings.Builder
	b.WriteString("checked_at,enclosure_id,staff_id,observed,notes\n")
	for i := range careBlockSize*2 + 300 {
		// Later rows name ids and notes the first rows never do.
		fmt.Fprintf(&b, "2026-01-%02dT07:00,E%d,%s,yes,n%d\n", 1+i%28, 1+i%2, []string{"K1", "V1"}[i*3/(careBlockSize*2+300)%2], i/1000)
	}
	data := b.String()
	fsys := folder(map[string]string{careFile: data})
	nl := newlines([]byte(data), 1<<20)
	for _, k := range []int{1, 100, careBlockSize - 1, careBlockSize, careBlockSize + 1, 2 * careBlockSize, len(nl) - 3} {
		sameSplitLoad(t, fsys, []int64{nl[k]}, "block edge "+strconv.Itoa(k))
		if !splitJoins(t, fsys, careFile, []int64{nl[k]}) {
			t.Errorf("cut after line %d fell back", k+1)
		}
	}
	sameSplitLoad(t, fsys, []int64{nl[careBlockSize-1], nl[careBlockSize+5], nl[2*careBlockSize]}, "four ranges")
}

// loadCase is one input of the FuzzLoadCSV corpus: the file it is written
// to (an index into fuzzFiles) and its bytes.
type loadCase struct {
	which int
	data  []byte
}

// loadCorpus reads the FuzzLoadCSV corpus.
func loadCorpus(t *testing.T) []loadCase {
	t.Helper()
	files, err := filepath.Glob(filepath.Join("testdata", "fuzz", "FuzzLoadCSV", "*"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no corpus: %v", err)
	}
	var out []loadCase
	for _, f := range files {
		b, err := os.ReadFile(f)
		if err != nil {
			t.Fatal(err)
		}
		var c loadCase
		for l := range strings.Lines(string(b)) {
			l = strings.TrimSpace(l)
			if lit, ok := strings.CutPrefix(l, "byte("); ok {
				r, _, _, err := strconv.UnquoteChar(strings.Trim(strings.TrimSuffix(lit, ")"), "'"), '\'')
				if err != nil {
					t.Fatalf("%s: %v", f, err)
				}
				c.which = int(r)
			}
			if lit, ok := strings.CutPrefix(l, "[]byte("); ok {
				s, err := strconv.Unquote(strings.TrimSuffix(lit, ")"))
				if err != nil {
					t.Fatalf("%s: %v", f, err)
				}
				c.data = []byte(s)
			}
		}
		out = append(out, c)
	}
	return out
}

// TestAppendCommas: the commas found eight bytes at a time are those a
// byte-by-byte look finds, next to every byte value and at every offset.
func TestAppendCommas(t *testing.T) {
	for v := range 256 {
		for n := range 20 {
			b := bytes.Repeat([]byte{byte(v)}, n)
			for i := 0; i < n; i += 3 {
				b[i] = ','
			}
			var want []int
			for i, c := range b {
				if c == ',' {
					want = append(want, i)
				}
			}
			if got := appendCommas(nil, b); !reflect.DeepEqual(got, want) {
				t.Fatalf("%q: commas at %v, want %v", b, got, want)
			}
		}
	}
}

// TestCareRefsSearchedInParts: with rounds enough to be searched for a
// failing reference in parts on several goroutines, rounds naming unknown
// ids in either part are each rejected, in line order, and the others
// kept in order.
func TestCareRefsSearchedInParts(t *testing.T) {
	defer func(n int) { runtime.GOMAXPROCS(n) }(runtime.GOMAXPROCS(2))
	const rows = 140000
	bad := map[int]string{90000: "E7", 120000: "E8", 130000: "K9"}
	for _, first := range []bool{false, true} {
		if first {
			bad[5] = "E6"
		}
		var b strings.Builder
		b.WriteString("checked_at,enclosure_id,staff_id,observed\n")
		for i := range rows {
			enc, staff := "E1", "K1"
			if id, ok := bad[i]; ok && id[0] == 'E' {
				enc = id
			} else if ok {
				staff = id
			}
			fmt.Fprintf(&b, "2026-01-%02dT07:00,%s,%s,yes\n", 1+i%28, enc, staff)
		}
		s := mustLoad(t, folder(map[string]string{careFile: b.String()}))
		var want []string
		for _, i := range []int{5, 90000, 120000, 130000} {
			if id, ok := bad[i]; ok {
				col := "enclosure_id"
				if id[0] == 'K' {
					col = "staff_id"
				}
				want = append(want, fmt.Sprintf("daily_care.csv:%d %s %s", i+2, col, id))
			}
		}
		var got []string
		for _, p := range s.Problems {
			got = append(got, fmt.Sprintf("%s:%d %s %s", p.File, p.Line, p.Column, p.Value))
		}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("problems %v, want %v", got, want)
		}
		c := s.CareRounds()
		if c.Len() != rows-len(want) || c.Ref(c.Len()-1) != Ref(fmt.Sprintf("daily_care.csv:%d", rows+1)) {
			t.Errorf("%d rounds kept, the last %s", c.Len(), c.Ref(c.Len()-1))
		}
	}
}
