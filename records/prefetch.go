package records

import (
	"encoding/csv"
	"errors"
	"sync"
	"unsafe"
)

// prefetchRows reads a CSV file's rows on a goroutine of its own, so the
// tokenizing of one batch of rows runs on another core while the loader
// decodes the batch before it. The rows, their lines, spans and errors come
// out exactly as csvRows gives them, in the same order.
//
// Memory stays bounded: at most prefetchDepth batches exist at once (one
// being filled, one waiting, one being decoded), each capped in rows and in
// bytes, so a large file is never read far ahead of the decoding.
type prefetchRows struct {
	base    string
	ch      <-chan *rowBatch
	free    chan<- *rowBatch
	done    chan struct{}
	once    sync.Once
	stopped bool
	cur     *rowBatch
	i       int // the next row of cur
	row     *fetchedRow
	final   error // io.EOF or the error that stopped the file, once reached
}

// The batch caps. A batch is sent when it has batchRows rows or its cells
// hold batchBytes bytes, whichever comes first; a single row can take it
// past batchBytes by at most one line's cap. (Variables so that tests can
// put batch boundaries anywhere.)
var (
	batchRows  = 1024
	batchBytes = 128 << 10
)

// prefetchDepth is the most batches one reader has at once.
const prefetchDepth = 3

// prefetchMinBytes is the smallest CSV file read by a prefetching reader.
// Reading overlaps decoding only over several batches, and each reader
// holds up to three batches (under 1 MB): below about ten batches of rows
// the goroutine is not worth its memory. Measured with BenchmarkPrefetch on
// 2 shared cores, prefetching already pays at 10,000 care rounds (0.9 MB).
// (A variable so tests can read small files both ways.)
var prefetchMinBytes int64 = 1 << 20

// rowBatch is a run of rows in file order. The text of all its cells is
// one buffer and the cells are views of it (no string is made per row):
// buffer, cells and rows are reused once the loader has moved past the
// batch. So a cell is valid only until the reader's next batch, and what
// the loader keeps of a cell it copies (decoder.intern, strings.Clone,
// printable in a Problem).
type rowBatch struct {
	rows  []fetchedRow
	cells []string
	text  []byte
}

// poisonCells, set by tests, overwrites a reader's cell text (a batch's,
// or csvRows' row) once the loader has moved past it, so a cell kept
// without copying shows.
var poisonCells bool

// fetchedRow is what csvRows.next and span return for one row.
type fetchedRow struct {
	lo, hi     int // the row's cells in the batch's cells
	start, end int // the lines it took
	err        error
	// text is true when every cell passed textIssue: the loader need not
	// check them again (a row that fails is checked again by the loader,
	// which words the message).
	text bool
}

// newPrefetchRows starts reading r on a goroutine of its own, in batches of
// at most rows rows and bytes bytes of cells. Call stop when done with it
// (early or not): the goroutine has ended when stop returns, even if the
// file was not read to its end.
func newPrefetchRows(r *csvReader, base string, rows, bytes int) *prefetchRows {
	ch := make(chan *rowBatch, prefetchDepth-2)
	free := make(chan *rowBatch, prefetchDepth)
	p := &prefetchRows{base: base, ch: ch, free: free, done: make(chan struct{})}
	go produce(r, ch, free, p.done, rows, bytes)
	return p
}

// produce reads rows into batches until the end of the file, an error that
// stops it, or done. It holds no reference to the prefetchRows.
func produce(r *csvReader, ch chan<- *rowBatch, free <-chan *rowBatch, done <-chan struct{}, maxRows, maxBytes int) {
	defer close(ch)
	made := 0
	for {
		var b *rowBatch
		if made < prefetchDepth {
			// Until there are prefetchDepth batches, a new one rather than wait.
			select {
			case b = <-free:
			default:
				b = &rowBatch{rows: make([]fetchedRow, 0, min(maxRows, 256)), cells: make([]string, 0, min(maxRows, 256)*8),
					text: make([]byte, 0, min(maxBytes, batchBytes)+4096)}
				made++
			}
		} else {
			select {
			case b = <-free:
			case <-done:
				return
			}
		}
		b.rows, b.cells, b.text = b.rows[:0], b.cells[:0], b.text[:0]
		last := false
		for size := 0; len(b.rows) < maxRows && size < maxBytes; {
			if len(b.rows)%64 == 63 {
				select { // stopped: leave the rest of the file unread
				case <-done:
					return
				default:
				}
			}
			err := r.readRaw()
			fr := fetchedRow{start: r.start, end: r.end, err: err}
			if err == nil {
				text, shared := b.room(len(r.recBuf))
				base := len(text)
				text = append(text, r.recBuf...)
				if shared {
					b.text = text
				}
				fr.lo = len(b.cells)
				prev := 0
				for _, e := range r.ends {
					c := ""
					if e > prev {
						c = unsafe.String(&text[base+prev], e-prev)
					}
					b.cells = append(b.cells, c)
					prev = e + 1
				}
				fr.hi = len(b.cells)
				fr.text = r.rowText()
				size += len(r.recBuf) + 1 // the separators are in recBuf, and an empty row counts too
			}
			b.rows = append(b.rows, fr)
			if err != nil && stopsFile(err) {
				last = true // io.EOF, or an error that stops the file
				break
			}
		}
		select {
		case ch <- b:
		case <-done:
			return
		}
		if last {
			return
		}
	}
}

// room returns the buffer a row of n bytes of text is to be appended to
// without moving (the cells before are views of it): the batch's, when it
// has room or holds nothing yet (it is then grown), else one of the row's
// own, which is not reused (shared is then false).
func (b *rowBatch) room(n int) (buf []byte, shared bool) {
	switch {
	case len(b.text)+n <= cap(b.text):
		return b.text, true
	case len(b.text) == 0:
		b.text = make([]byte, 0, max(2*cap(b.text), n))
		return b.text, true
	}
	return make([]byte, 0, n), false
}

// errRowsStopped is what a stopped reader gives: the file was not read to
// its end.
var errRowsStopped = errors.New("reading was stopped before the end of the file")

// stopsFile reports whether an error of csvReader.Read ends the file (the
// end itself, or a failure) rather than rejecting one row.
func stopsFile(err error) bool {
	var pe *csv.ParseError
	return !errors.As(err, &pe)
}

func (p *prefetchRows) next() ([]string, int, error) {
	if p.stopped {
		return nil, 0, p.final
	}
	for p.cur == nil || p.i == len(p.cur.rows) {
		if p.final != nil {
			return nil, 0, p.final
		}
		if p.cur != nil {
			if poisonCells {
				for i := range p.cur.text {
					p.cur.text[i] = '#'
				}
			}
			select { // the loader is done with the batch's cells
			case p.free <- p.cur:
			default:
			}
			p.cur = nil
		}
		b, ok := <-p.ch
		if !ok {
			// Only after stop: the producer otherwise ends on a row that says why.
			p.final = errRowsStopped
			return nil, 0, p.final
		}
		p.cur, p.i = b, 0
	}
	fr := &p.cur.rows[p.i]
	p.i++
	p.row = fr
	if fr.err != nil {
		if stopsFile(fr.err) {
			p.final = fr.err
		}
		return nil, 0, fr.err
	}
	return p.cur.cells[fr.lo:fr.hi:fr.hi], fr.start, nil
}

func (p *prefetchRows) refBase() string { return p.base }

// span is the first and last line of the row just read.
func (p *prefetchRows) span() (int, int) {
	if p.row == nil {
		return 0, 0
	}
	return p.row.start, p.row.end
}

// textChecked reports whether every cell of the row just read is text
// within the cell cap, as textIssue checks it.
func (p *prefetchRows) textChecked() bool { return p.row != nil && p.row.err == nil && p.row.text }

// stop ends the producer and waits for it to end, so that nothing reads
// the file once the loader closes it; the reader gives no more rows after
// it. The producer looks for the stop between rows, every 64 rows.
func (p *prefetchRows) stop() {
	p.once.Do(func() {
		close(p.done)
		for range p.ch { // batches it had sent, until it ends and closes ch
		}
		p.stopped = true
		if p.final == nil {
			p.final = errRowsStopped
		}
	})
}
