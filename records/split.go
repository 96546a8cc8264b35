package records

import (
	"bufio"
	"bytes"
	"context"
	"errors"
	"io"
	"io/fs"
	"reflect"
	"runtime"
	"sync"
)

// A large CSV file is read in byte ranges, one per core, each tokenized and
// decoded on a goroutine of its own into its own rows, problems and store,
// and the ranges are then joined in file order. The result is the one the
// sequential reader gives: the same rows in the same order, the same line
// numbers and refs, the same rejected rows and messages, the same counts
// and the same store, table of strings included.
//
// A range starts after a newline. That newline ends a record unless it is
// inside a quoted cell; then the range before it ends inside the quote,
// which its reader sees (csvReader.openAtEnd) and stops at, before the row
// where the quote opened. The rows before that row are the sequential
// reader's (the ranges before, and this range, started at the start of a
// record); those of the ranges after it are dropped, and the rest of the
// file is read again from that row's first line, in ranges again (a
// reader starting at the start of a record reads what the sequential
// reader reads from there). A file whose ranges stop on an error that
// ends a file (a line over the cap, a cancelled run), and a file whose
// header makes it unusable, are read again from the start by the
// sequential reader: those paths are rare, and it words them.
//
// Only files whose rows are not keyed by a unique id are read in ranges: a
// duplicate id must be judged against every row before it, in order.

// splitMinBytes is the smallest CSV file read in ranges. Below it, one
// range with its prefetching reader is fast enough that joining is not
// worth it (care rounds are the one file that gets there).
// (A variable so tests can read small files in ranges.)
var splitMinBytes int64 = 16 << 20

// splitRanges is the number of ranges; 0 means one per core
// (GOMAXPROCS), at most maxRanges. (A variable for tests.)
var splitRanges = 0

// splitTargets, when set (by tests), gives the offsets the ranges are cut
// at, or just before, instead of equal parts.
var splitTargets func(from, size int64, n int) []int64

const maxRanges = 8

// splitResumed, when set (by tests), is told each offset and line the
// rest of a file is read again from after a range ended inside a quoted
// cell (see readSpans).
var splitResumed func(off int64, line int)

// splitSearch is how far past a target offset a newline is looked for.
const splitSearch = 1 << 20

// loadSplit reads a CSV file in ranges and returns the loaded file, or nil
// when the file is not one to read in ranges or the ranges could not be
// joined; the caller then reads it sequentially.
func loadSplit[T any](ctx context.Context, fsys fs.FS, spec *fileSpec[T], e *env, src *source) *loaded[T] {
	if spec.id != nil || !src.csv() {
		return nil
	}
	n := splitRanges
	if n == 0 {
		n = min(runtime.GOMAXPROCS(0), maxRanges)
	}
	if n < 2 {
		return nil
	}
	rt, err := rowTypeOf(reflect.TypeFor[T]())
	if err != nil {
		return nil
	}
	f, err := OpenFile(ctx, fsys, src.file)
	if err != nil {
		return nil // the sequential reader says why
	}
	defer f.Close()
	c, ok := f.(*capped)
	if !ok {
		return nil
	}
	ra, ok := c.f.(io.ReaderAt)
	size := csvSize(f)
	if !ok || size < splitMinBytes {
		return nil
	}
	cuts := splitPoints(ctx, ra, 0, size, n)
	if len(cuts) < 3 {
		return nil
	}
	l := newLoaded(spec, src, e)
	if !readRanges(ctx, l, ra, cuts, rt, e) {
		// The ranges' rows are garbage now: collect them before the file
		// is read again, rather than hold both at the peak.
		runtime.GC()
		return nil
	}
	return l
}

// splitPoints cuts [from, size) into at most n ranges, each starting
// just after a newline: the offsets from, the starts of the ranges after
// the first, and size. Fewer than 3 offsets means it is read whole.
//
// A range is cut after a newline with an even number of quotes on the
// line before it and on the line after it, the first such within the
// search after its target (after the first newline at or after it, when
// there is none: every row or two has a line break in quotes). A newline inside a quoted cell of two or three lines
// has an odd number of quotes on one side, so a note with a line break
// does not make the ranges be read again (see readSpans); only a quoted
// cell of four lines or more can still be cut inside.
func splitPoints(ctx context.Context, ra io.ReaderAt, from, size int64, n int) []int64 {
	var targets []int64
	if splitTargets != nil {
		targets = splitTargets(from, size, n)
	} else {
		for k := 1; k < n; k++ {
			targets = append(targets, from+(size-from)*int64(k)/int64(n))
		}
	}
	cuts := []int64{from}
	var buf []byte
	for _, t := range targets {
		if t <= cuts[len(cuts)-1] {
			continue
		}
		if buf == nil {
			buf = make([]byte, splitSearch)
		}
		m, err := ra.ReadAt(buf[:min(int64(len(buf)), size-t)], t)
		if (err != nil && err != io.EOF) || ctx.Err() != nil {
			break // the sequential reader says why, if it can
		}
		first, quiet := cutAfter(buf[:m])
		if first < 0 {
			break // a line longer than the search: read the rest as one range
		}
		cut := t + int64(first) + 1
		if quiet >= 0 && splitTargets == nil {
			cut = t + int64(quiet) + 1
		}
		if cut < size {
			cuts = append(cuts, cut)
		}
	}
	return append(cuts, size)
}

// cutAfter is the offset of b's first newline, and of its first newline
// after that with an even number of quotes on the whole line before it
// and on the whole line after it (see splitPoints); -1 when none.
func cutAfter(b []byte) (first, quiet int) {
	first = bytes.IndexByte(b, '\n')
	if first < 0 {
		return -1, -1
	}
	// Lines of b after its first newline, each ended by a newline; a
	// newline is quiet when the line it ends and the next are even.
	prevEven := false
	for start := first + 1; ; {
		i := bytes.IndexByte(b[start:], '\n')
		if i < 0 {
			return first, -1 // the next line is not whole in b
		}
		end := start + i
		even := bytes.Count(b[start:end], []byte{'"'})%2 == 0
		if prevEven && even {
			return first, start - 1
		}
		prevEven = even
		start = end + 1
	}
}

// rangeReader reads the bytes [off, end) of a file, stopping soon after
// ctx is done.
type rangeReader struct {
	ctx      context.Context
	ra       io.ReaderAt
	off, end int64
}

// errFileShrank is a range that ends before its end: the file changed
// while it was read.
var errFileShrank = errors.New("the file became shorter while it was read")

func (r *rangeReader) Read(p []byte) (int, error) {
	if err := r.ctx.Err(); err != nil {
		return 0, err
	}
	if r.off >= r.end {
		return 0, io.EOF
	}
	if int64(len(p)) > r.end-r.off {
		p = p[:r.end-r.off]
	}
	m, err := r.ra.ReadAt(p, r.off)
	r.off += int64(m)
	if err == io.EOF {
		err = nil
		if m == 0 {
			err = errFileShrank
		}
	}
	return m, err
}

// countLines counts the newlines of [off, end).
func countLines(ctx context.Context, ra io.ReaderAt, off, end int64) (int, error) {
	r := &rangeReader{ctx: ctx, ra: ra, off: off, end: end}
	buf := make([]byte, 1<<20)
	n := 0
	for {
		m, err := r.Read(buf)
		n += bytes.Count(buf[:m], []byte{'\n'})
		if err == io.EOF {
			return n, nil
		}
		if err != nil {
			return 0, err
		}
	}
}

// rangeRows reads the rows of [off, end), numbering lines from line+1;
// stopOpen ends it at a row still open at end (see csvReader.stopOpen).
// A range is read and decoded on one goroutine: the ranges already keep
// every core busy, and a prefetching goroutine each (measured on 2 shared
// cores) saves no time while it adds a hand-over per batch.
func rangeRows(ctx context.Context, ra io.ReaderAt, off, end int64, line int, base string, stopOpen bool) (*csvRows, *csvReader) {
	br := bufio.NewReaderSize(&rangeReader{ctx: ctx, ra: ra, off: off, end: end}, 4096)
	if off == 0 {
		skipBOM(br)
	}
	r := newCSVReader(br)
	r.numLine = line
	r.stopOpen = stopOpen
	return &csvRows{r: r, base: base}, r
}

// maxResumes is how many times the rest of a file is read in ranges again
// after a range ended inside a quoted cell (see readSpans); after that, or
// when a try makes no headway, the rest is read as one range.
const maxResumes = 2

// readRanges reads the file into l in the ranges between cuts (see
// splitPoints), and reports whether they joined into what the sequential
// reader gives; when not, l is to be dropped.
func readRanges[T any](ctx context.Context, l *loaded[T], ra io.ReaderAt, cuts []int64, rt *rowType, e *env) bool {
	n := len(cuts) - 1
	rr, r0 := rangeRows(ctx, ra, cuts[0], cuts[1], 0, l.file+":", n > 1)
	p, ok := l.begin(rr, rt, false)
	if !ok {
		return false
	}
	size := cuts[n]
	off, line, resume, ok := readSpans(ctx, l, ra, cuts, 0, rr, r0, p, e)
	for tries := 0; ok && resume; tries++ {
		// A range ended inside a quoted cell: l holds every row before the
		// row where that quote opened, and the rest is read from there.
		// The rows of the ranges after it are garbage now: collect them
		// first, rather than hold both at the peak.
		runtime.GC()
		if splitResumed != nil {
			splitResumed(off, line+1)
		}
		rest := []int64{off, size}
		if tries < maxResumes {
			rest = splitPoints(ctx, ra, off, size, n)
		}
		var next int64
		next, line, resume, ok = readSpans(ctx, l, ra, rest, line, nil, nil, p, e)
		if resume && next <= off {
			// The quote is open past the next cut too: the rest as one.
			next, line, resume, ok = readSpans(ctx, l, ra, []int64{off, size}, line, nil, nil, p, e)
		}
		off = next
	}
	if !ok {
		return false
	}
	l.flatten()
	if l.store != nil {
		l.store.done()
	}
	return true
}

// readSpans reads the ranges between cuts after l's rows, the first into
// l itself (through rr and r0 when given, whose header l has read), the
// first line of cuts[0] being line+1. It reports whether the ranges
// joined into what the sequential reader gives from cuts[0] on (ok); when
// not, l is to be dropped. When a range but the last ended inside a
// quoted cell, l has every row of the ranges before it and of that range
// up to the row where the quote opened, which starts at off on line
// line+1: resume is set, and the rest is the caller's to read.
func readSpans[T any](ctx context.Context, l *loaded[T], ra io.ReaderAt, cuts []int64, line int, rr *csvRows, r0 *csvReader, p *plan, e *env) (off int64, next int, resume, ok bool) {
	n := len(cuts) - 1
	// The first line of each range: the newlines before it, counted while
	// the first range is read.
	lines := make([]int, n)
	countErr := make([]error, n)
	var counted sync.WaitGroup
	for k := 1; k < n; k++ {
		counted.Go(func() { lines[k], countErr[k] = countLines(ctx, ra, cuts[k-1], cuts[k]) })
	}
	base := l.file + ":"
	if rr == nil {
		rr, r0 = rangeRows(ctx, ra, cuts[0], cuts[1], line, base, n > 1)
	}
	parts := make([]*loaded[T], n)
	readers := make([]*csvReader, n)
	parts[0], readers[0] = l, r0
	var wg sync.WaitGroup
	for k := 1; k < n; k++ {
		part := &loaded[T]{spec: l.spec, present: true, count: FileCount{File: l.count.File}, file: l.file, plan: p, local: l.local}
		if l.spec.store != nil {
			part.store = l.spec.store(e.loc)
		}
		parts[k] = part
		wg.Go(func() {
			counted.Wait()
			for _, err := range countErr {
				if err != nil {
					return // part read no row: the join below fails
				}
			}
			first := line
			for _, c := range lines[1 : k+1] {
				first += c
			}
			rr, r := rangeRows(ctx, ra, cuts[k], cuts[k+1], first, base, k < n-1)
			readers[k] = r
			d := newDecoder(p, e, l.file)
			d.refBase = rr.refBase()
			part.read(rr, d, e)
		})
	}
	d := newDecoder(p, e, l.file)
	d.refBase = rr.refBase()
	l.read(rr, d, e)
	wg.Wait()

	// Each range but the last must end where the next begins: at the end
	// of a record, on the line before the next range's first. A range that
	// ends inside a quoted cell (its rows stop before the row the quote
	// opened) keeps the rows before it, and the rest is read again.
	end := line // the last line of range k
	for k := range n {
		r := readers[k]
		if r == nil || parts[k].count.Failed != "" {
			return 0, 0, false, false // a range stopped on an error that ends the file
		}
		if k == n-1 {
			break
		}
		end += lines[k+1]
		if r.openAtEnd {
			off, err := lineStart(ctx, ra, cuts[k], cuts[k+1], end, r.openLine)
			if err != nil {
				return 0, 0, false, false
			}
			for _, part := range parts[1 : k+1] {
				if !l.join(part) {
					return 0, 0, false, false
				}
			}
			return off, r.openLine - 1, true, true
		}
		if r.numLine != end {
			return 0, 0, false, false
		}
	}
	for _, part := range parts[1:] {
		if !l.join(part) {
			return 0, 0, false, false
		}
	}
	return 0, 0, false, true
}

// lineStart is the offset where line starts in [from, to), a range whose
// last line, last, ends with the newline just before to. It is looked for
// from the end: a quote left open at a range's end most often opened a
// few lines before it.
func lineStart(ctx context.Context, ra io.ReaderAt, from, to int64, last, line int) (int64, error) {
	// The newline that ends the line before line is the (last-line+2)th
	// from the end; none is left when line is the range's first.
	left := last - line + 2
	buf := make([]byte, 64<<10)
	for hi := to; hi > from; {
		if err := ctx.Err(); err != nil {
			return 0, err
		}
		lo := max(from, hi-int64(len(buf)))
		m, err := ra.ReadAt(buf[:hi-lo], lo)
		if m < int(hi-lo) {
			if err == nil || err == io.EOF {
				err = errFileShrank
			}
			return 0, err
		}
		b := buf[:m]
		for {
			i := bytes.LastIndexByte(b, '\n')
			if i < 0 {
				break
			}
			if left--; left == 0 {
				return lo + int64(i) + 1, nil
			}
			b = b[:i]
		}
		hi = lo
	}
	if left == 1 {
		return from, nil
	}
	return 0, errors.New("a line not in its range")
}

// join appends the rows, account and problems of the range after l's.
func (l *loaded[T]) join(part *loaded[T]) bool {
	if l.store != nil {
		if !l.store.appendStore(part.store) {
			return false
		}
	} else {
		if len(l.rows) > 0 {
			l.chunks = append(l.chunks, l.rows)
		}
		l.chunks = append(l.chunks, part.chunks...)
		l.rows = part.rows
	}
	l.count.Read += part.count.Read
	l.count.Accepted += part.count.Accepted
	l.count.Rejected += part.count.Rejected
	l.problems = append(l.problems, part.problems...)
	if len(part.extra) > 0 && l.extra == nil {
		l.extra = map[Ref]map[string]string{}
	}
	for ref, m := range part.extra {
		l.extra[ref] = m
	}
	return true
}
