package records

import (
	"strconv"
	"strings"
)

// LoadError is a failure of the folder as a whole: it cannot be read, a
// required file is missing, or facility.yaml is unusable. No Set is returned
// with it, because every later check depends on what failed.
type LoadError struct {
	File   string
	Line   int    // 0 when the failure has no line (a missing file)
	Column string // the YAML key or CSV column, when there is one
	Reason string
	Err    error // the underlying error, if any (for errors.Is, e.g. fs.ErrNotExist)
	// Also holds the file's further problems, so that a keeper fixes them
	// all in one go (facility.yaml reports every problem at once).
	Also []*LoadError
}

// Error is the problem's line, then each of Also on a line of its own.
func (e *LoadError) Error() string {
	s := position(e.File, e.Line, e.Column, e.Reason)
	for _, a := range e.Also {
		s += "\n" + a.Error()
	}
	return s
}

func (e *LoadError) Unwrap() error { return e.Err }

// Error makes a Problem printable and usable as an error, in the same
// one-line form as LoadError: "daily_care.csv:212: water: "frozn" is not one of ...".
func (p Problem) Error() string {
	if p.At != "" {
		return position(p.File+":"+p.At, 0, p.Column, p.Reason)
	}
	return position(p.File, p.Line, p.Column, p.Reason)
}

// Where is the problem's place without its reason: "daily_care.csv:212",
// "daily_care.xlsx:daily_care!C212", or the file alone for a whole-file problem.
func (p Problem) Where() string {
	switch {
	case p.At != "":
		return p.File + ":" + p.At
	case p.Line > 0:
		return p.File + ":" + strconv.Itoa(p.Line)
	}
	return p.File
}

// Row is the place of the problem's row, without the cell:
// "daily_care.csv:212", "records.xlsx:daily_care!212", or the file (and
// sheet) for a whole-file problem.
func (p Problem) Row() Ref {
	sheet, _, hasCell := strings.Cut(p.At, "!")
	switch {
	case p.At != "" && hasCell && p.Line > 0:
		return Ref(p.File + ":" + sheet + "!" + strconv.Itoa(p.Line))
	case p.At != "":
		return Ref(p.File + ":" + sheet)
	case p.Line > 0:
		return Ref(p.File + ":" + strconv.Itoa(p.Line))
	}
	return Ref(p.File)
}

// String is the problem's one-line form.
func (p Problem) String() string { return p.Error() }

// String is "FILE: COLUMN: MESSAGE" (or "FILE: MESSAGE" for a whole file).
func (w Warning) String() string { return position(w.File, 0, w.Column, w.Message) }

// Rejected returns the number of rows rejected across all files.
func (s *Set) Rejected() int {
	n := 0
	for _, c := range s.Accounting {
		n += c.Rejected
	}
	return n
}

// Count returns the accounting of one file, and whether it was read.
func (s *Set) Count(file string) (FileCount, bool) {
	for _, c := range s.Accounting {
		if c.File == file {
			return c, true
		}
	}
	return FileCount{File: file}, false
}

func position(file string, line int, column, reason string) string {
	var b strings.Builder
	b.WriteString(file)
	if line > 0 {
		b.WriteByte(':')
		b.WriteString(strconv.Itoa(line))
	}
	b.WriteString(": ")
	if column != "" {
		b.WriteString(column)
		b.WriteString(": ")
	}
	b.WriteString(reason)
	return b.String()
}

// String is one line of the accounting: "daily_care.csv: read 212, accepted 210, rejected 2".
func (c FileCount) String() string {
	s := c.File + ": read " + strconv.Itoa(c.Read) + ", accepted " + strconv.Itoa(c.Accepted) + ", rejected " + strconv.Itoa(c.Rejected)
	if c.Failed != "" {
		s += " (file not used: " + c.Failed + ")"
	}
	return s
}
