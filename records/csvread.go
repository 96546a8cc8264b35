package records

import (
	"bufio"
	"bytes"
	"encoding/binary"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"math/bits"
	"unicode/utf8"
	"unsafe"
)

// csvReader reads comma-separated records as encoding/csv does (RFC 4180:
// "" for a quote inside quotes, CRLF or LF, blank lines skipped, the same
// errors for a bare or extraneous quote), with bounds:
//
//   - a physical line longer than MaxLineBytes stops the file;
//   - a quoted cell still open after MaxFieldBytes, or at the end of the
//     file, is an unclosed quote: the row where it opened is rejected,
//     saying how many lines the quote took in, and reading resumes on the
//     next line, so the rows after it are read rather than swallowed.
//
// Any other failure of a row that spans several lines (a quote closed in
// the wrong place) is recovered the same way.
type csvReader struct {
	br      *bufio.Reader
	numLine int
	lineBuf []byte
	// back holds lines to read again after a failed multi-line row, in order.
	back []heldLine
	// held are copies of the current row's lines while it spans several.
	held []heldLine
	// start and end are the first and last line of the row just read.
	start, end int
	recBuf     []byte
	ends       []int
	rec        []string
	fatal      error
	// openAtEnd is set when the input ended inside a quoted cell: a row
	// went on past the last line (see readRanges). openLine is the first
	// line of the first such row.
	openAtEnd bool
	openLine  int
	// stopOpen ends the input at a row still open at its end, as io.EOF,
	// instead of rejecting the row and reading on after its first line:
	// the input is a range of a file that goes on (see readSpans).
	stopOpen bool
}

type heldLine struct {
	text []byte
	n    int
}

// lineTooLongError stops a file whose line is over MaxLineBytes.
type lineTooLongError struct{ line int }

func (e *lineTooLongError) Error() string {
	return fmt.Sprintf("line %d is longer than the limit of %s a line: not a records file, or damaged", e.line, capSize(MaxLineBytes))
}

// quoteError is a quote that opened a cell and did not close it properly.
type quoteError struct {
	line, col int // where the quote opened
	lines     int // lines the quote took in, its own included
	how       string
}

func (e *quoteError) Error() string {
	return fmt.Sprintf("a quote opened on line %d (character %d) %s: it took in %d lines; the row is rejected and reading resumes on line %d",
		e.line, e.col, e.how, e.lines, e.line+1)
}

func newCSVReader(r io.Reader) *csvReader {
	return &csvReader{br: bufio.NewReaderSize(r, 1<<16)}
}

// Read returns the next record, reusing its backing slice. A *csv.ParseError
// rejects one row and reading can go on; io.EOF ends the file; any other
// error stops it (and is returned again by every later call).
func (r *csvReader) Read() ([]string, error) {
	if err := r.readRaw(); err != nil {
		return nil, err
	}
	return r.record(), nil
}

// readRaw reads the next record as Read does, leaving its cells in recBuf
// and ends (see record) rather than cutting them out.
func (r *csvReader) readRaw() error {
	if r.fatal != nil {
		return r.fatal
	}
	err := r.readRecord()
	if err != nil && err != io.EOF {
		var pe *csv.ParseError
		if !errors.As(err, &pe) {
			r.fatal = err
		}
	}
	return err
}

// readLine returns the next physical line with CRLF turned into LF, its
// number, and io.EOF when there is none.
func (r *csvReader) readLine() ([]byte, int, error) {
	if len(r.back) > 0 {
		l := r.back[0]
		r.back = r.back[1:]
		return l.text, l.n, nil
	}
	line, err := r.br.ReadSlice('\n')
	if err == bufio.ErrBufferFull {
		r.lineBuf = append(r.lineBuf[:0], line...)
		for err == bufio.ErrBufferFull {
			if len(r.lineBuf) > MaxLineBytes {
				return nil, 0, &lineTooLongError{line: r.numLine + 1}
			}
			line, err = r.br.ReadSlice('\n')
			r.lineBuf = append(r.lineBuf, line...)
		}
		line = r.lineBuf
	}
	if len(line) > MaxLineBytes+2 {
		return nil, 0, &lineTooLongError{line: r.numLine + 1}
	}
	if len(line) == 0 {
		if err == nil {
			err = io.EOF
		}
		return nil, 0, err
	}
	if err != nil && err != io.EOF {
		return nil, 0, err
	}
	r.numLine++
	if err == io.EOF && line[len(line)-1] == '\r' {
		line = line[:len(line)-1] // as encoding/csv: a CR before the end of the file is dropped
		if len(line) == 0 {
			return []byte{'\n'}, r.numLine, nil // a blank line
		}
	}
	if n := len(line); n >= 2 && line[n-2] == '\r' && line[n-1] == '\n' {
		line[n-2] = '\n'
		line = line[:n-1]
	}
	return line, r.numLine, nil
}

// hold keeps a copy of a line of a row that goes on to the next line.
func (r *csvReader) hold(line []byte, n int) {
	r.held = append(r.held, heldLine{text: bytes.Clone(line), n: n})
}

// recover rejects a multi-line row at its first line and puts its other
// lines back to be read again.
func (r *csvReader) recover(current []byte, n int, err error) error {
	if len(r.held) > 0 {
		again := make([]heldLine, 0, len(r.held)+len(r.back))
		again = append(again, r.held[1:]...)
		if current != nil {
			again = append(again, heldLine{text: bytes.Clone(current), n: n})
		}
		r.back = append(again, r.back...)
		r.held = r.held[:0]
	}
	return err
}

func (r *csvReader) readRecord() error {
	var (
		line []byte
		n    int
		err  error
	)
	for {
		line, n, err = r.readLine()
		if err != nil {
			return err
		}
		if !(len(line) == 1 && line[0] == '\n') {
			break // blank lines are skipped, as encoding/csv does
		}
	}
	r.start, r.end = n, n
	r.held = r.held[:0]
	r.recBuf = r.recBuf[:0]
	r.ends = r.ends[:0]
	if bytes.IndexByte(line, '"') < 0 {
		// No quote on the line (most rows): its cells are cut at its commas.
		body := bytes.TrimSuffix(line, []byte{'\n'})
		r.recBuf = append(r.recBuf, body...)
		r.ends = append(appendCommas(r.ends, body), len(body))
		return r.done()
	}
	pos := 0
	for {
		if pos < len(line) && line[pos] == '"' {
			openLine, openCol := r.end, pos+1
			fieldStart := len(r.recBuf)
			pos++
		quoted:
			for {
				i := bytes.IndexByte(line[pos:], '"')
				if i < 0 {
					// The cell goes on to the next line.
					r.recBuf = append(r.recBuf, line[pos:]...)
					if len(r.recBuf)-fieldStart > MaxFieldBytes {
						qe := &quoteError{line: openLine, col: openCol, lines: r.end - openLine + 1,
							how: "is still open after " + capSize(MaxFieldBytes)}
						return r.recover(line, r.end, &csv.ParseError{StartLine: r.start, Line: r.start, Column: openCol, Err: qe})
					}
					r.hold(line, r.end)
					var next []byte
					next, n, err = r.readLine()
					if err == io.EOF {
						if !r.openAtEnd {
							r.openLine = r.start
						}
						r.openAtEnd = true
						if r.stopOpen {
							r.held = r.held[:0]
							return io.EOF
						}
						qe := &quoteError{line: openLine, col: openCol, lines: r.end - openLine + 1, how: "is never closed"}
						return r.recover(nil, 0, &csv.ParseError{StartLine: r.start, Line: r.start, Column: openCol, Err: qe})
					}
					if err != nil {
						return err
					}
					line, pos, r.end = next, 0, n
					continue
				}
				r.recBuf = append(r.recBuf, line[pos:pos+i]...)
				pos += i + 1
				switch {
				case pos < len(line) && line[pos] == '"':
					r.recBuf = append(r.recBuf, '"')
					pos++
				case pos < len(line) && line[pos] == ',':
					pos++
					r.ends = append(r.ends, len(r.recBuf))
					r.recBuf = append(r.recBuf, ',')
					break quoted
				case pos == len(line) || (pos == len(line)-1 && line[pos] == '\n'):
					r.ends = append(r.ends, len(r.recBuf))
					return r.done()
				default:
					if r.end > openLine {
						qe := &quoteError{line: openLine, col: openCol, lines: r.end - openLine + 1,
							how: fmt.Sprintf("closes on line %d (character %d) with more text after it", r.end, pos)}
						return r.recover(line, r.end, &csv.ParseError{StartLine: r.start, Line: r.start, Column: openCol, Err: qe})
					}
					return r.recover(line, r.end, &csv.ParseError{StartLine: r.start, Line: r.end, Column: pos, Err: csv.ErrQuote})
				}
			}
			continue
		}
		rest := line[pos:]
		i := bytes.IndexByte(rest, ',')
		last := i < 0
		field := rest
		if last {
			field = bytes.TrimSuffix(rest, []byte{'\n'})
		} else {
			field = rest[:i]
		}
		if j := bytes.IndexByte(field, '"'); j >= 0 {
			return r.recover(line, r.end, &csv.ParseError{StartLine: r.start, Line: r.end, Column: pos + j + 1, Err: csv.ErrBareQuote})
		}
		r.recBuf = append(r.recBuf, field...)
		r.ends = append(r.ends, len(r.recBuf))
		if last {
			return r.done()
		}
		r.recBuf = append(r.recBuf, ',')
		pos += i + 1
	}
}

// record cuts the record's cells out of one string: recBuf holds them
// joined by commas (their quotes removed), and ends are where each ends.
func (r *csvReader) record() []string {
	str := string(r.recBuf)
	r.rec = r.rec[:0]
	prev := 0
	for _, e := range r.ends {
		r.rec = append(r.rec, str[prev:e])
		prev = e + 1
	}
	return r.rec
}

// views cuts the record's cells out of recBuf without copying: they are
// valid until the next record is read.
func (r *csvReader) views() []string {
	r.rec = r.rec[:0]
	prev := 0
	for _, e := range r.ends {
		c := ""
		if e > prev {
			c = unsafe.String(&r.recBuf[prev], e-prev)
		}
		r.rec = append(r.rec, c)
		prev = e + 1
	}
	return r.rec
}

// done ends a record that was read whole.
func (r *csvReader) done() error {
	r.held = r.held[:0]
	return nil
}

// appendCommas appends the offsets of b's commas to ends, eight bytes at
// a time: a byte of x that is zero (a comma, once xor-ed) is the one whose
// high bit survives, exactly, in ^((x&0x7f…+0x7f…)|x|0x7f…).
func appendCommas(ends []int, b []byte) []int {
	const (
		ones  = 0x0101010101010101
		seven = 0x7f7f7f7f7f7f7f7f
	)
	i := 0
	for ; i+8 <= len(b); i += 8 {
		x := binary.LittleEndian.Uint64(b[i:]) ^ (ones * ',')
		for y := ^((x&seven + seven) | x | seven); y != 0; y &= y - 1 {
			ends = append(ends, i+bits.TrailingZeros64(y)/8)
		}
	}
	for ; i < len(b); i++ {
		if b[i] == ',' {
			ends = append(ends, i)
		}
	}
	return ends
}

// rowText reports whether every cell of the record just read is text as
// textIssue checks it (no NUL byte, UTF-8, within MaxFieldBytes), in one
// pass over the record's bytes rather than one per cell. The cells are
// consecutive pieces of those bytes: the whole being UTF-8 with each cell
// starting on a character makes each cell UTF-8, and a cell that is UTF-8
// starts on a character, so the answer is the same as cell by cell (the
// commas between them are characters of their own).
func (r *csvReader) rowText() bool {
	b := r.recBuf
	if bytes.IndexByte(b, 0) >= 0 || !utf8.Valid(b) {
		return false
	}
	prev := 0
	for _, e := range r.ends {
		if e-prev > MaxFieldBytes || (e > prev && !utf8.RuneStart(b[prev])) {
			return false
		}
		prev = e + 1
	}
	return true
}
