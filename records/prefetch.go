package records

import (
	"encoding/csv"
	"errors"
	"io"
)

// prefetchBatch is how many rows the reading goroutine hands over at once.
const prefetchBatch = 512

// prefetchRows reads a CSV file's rows on a goroutine of its own, a few
// batches ahead of the rows being checked, so that with a core to spare
// the parsing of a large file (daily_care: millions of rows) overlaps its
// checking. Rows, lines, spans and errors come out exactly in the order
// read. A row's cells stay valid until the next batch is taken: nothing
// keeps the cell slice (the strings are the row's own), so batches are
// handed back and reused.
type prefetchRows struct {
	src  *csvRows
	ch   chan *rowBatch
	free chan *rowBatch
	stop chan struct{}
	done chan struct{}
	b    *rowBatch
	i    int
	cur  fetched
	end  error // the error that ended the file, returned again if asked
}

type rowBatch struct {
	rows  []fetched
	cells []string // the rows' cell slices point in here
}

// fetched is one result of csvRows.next, with the row's span.
type fetched struct {
	rec        []string
	line       int
	start, end int
	err        error
}

func prefetch(src *csvRows) *prefetchRows {
	p := &prefetchRows{src: src, ch: make(chan *rowBatch, 2), free: make(chan *rowBatch, 3),
		stop: make(chan struct{}), done: make(chan struct{})}
	go p.run()
	return p
}

// run reads until the end of the file or an error that stops it.
func (p *prefetchRows) run() {
	defer close(p.done)
	defer close(p.ch)
	for {
		var b *rowBatch
		select {
		case b = <-p.free:
			clear(b.rows)
			b.rows, b.cells = b.rows[:0], b.cells[:0]
		default:
			b = &rowBatch{rows: make([]fetched, 0, prefetchBatch)}
		}
		last := false
		for len(b.rows) < prefetchBatch && !last {
			rec, line, err := p.src.next()
			f := fetched{line: line, err: err}
			f.start, f.end = p.src.span()
			if err == nil {
				if cap(b.cells)-len(b.cells) < len(rec) {
					// A new slab: rows already in the batch keep the old one.
					b.cells = make([]string, 0, max(len(rec)*(prefetchBatch-len(b.rows)), 64))
				}
				n := len(b.cells)
				b.cells = append(b.cells, rec...)
				f.rec = b.cells[n:len(b.cells):len(b.cells)]
			} else {
				var pe *csv.ParseError
				last = !errors.As(err, &pe) // the end of the file, or a failure that stops it
			}
			b.rows = append(b.rows, f)
		}
		select {
		case p.ch <- b:
		case <-p.stop:
			return
		}
		if last {
			return
		}
	}
}

func (p *prefetchRows) next() ([]string, int, error) {
	if p.b == nil || p.i == len(p.b.rows) {
		if p.b != nil {
			select {
			case p.free <- p.b:
			default:
			}
			p.b = nil
		}
		b, ok := <-p.ch
		if !ok {
			if p.end == nil {
				return nil, 0, io.EOF
			}
			return nil, 0, p.end
		}
		p.b, p.i = b, 0
	}
	p.cur = p.b.rows[p.i]
	p.i++
	if p.cur.err != nil {
		var pe *csv.ParseError
		if !errors.As(p.cur.err, &pe) {
			p.end = p.cur.err
		}
	}
	return p.cur.rec, p.cur.line, p.cur.err
}

func (p *prefetchRows) refBase() string { return p.src.refBase() }

// span is the first and last line of the row just returned.
func (p *prefetchRows) span() (int, int) { return p.cur.start, p.cur.end }

// close stops the reading goroutine and waits for it, so the file can be
// closed after.
func (p *prefetchRows) close() {
	close(p.stop)
	<-p.done
}
