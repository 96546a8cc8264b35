package checker

import (
	"bytes"
	"cmp"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"hash"
	"hash/crc32"
	"io"
	"io/fs"
	"slices"
	"sort"
	"strings"
	"sync"
)

// The fingerprint is the SHA-256 over the inputs a check used: every
// records file the loader read, every rule file compiled (tests excluded:
// they do not change findings) and the limits text, each framed by its name
// and length so that moving bytes between files changes the sum. Records
// files are hashed in name order and rule files in the order they were
// read (each source's files in lexical order), so the same inputs always
// give the same fingerprint and a signed report can be tied to the records
// it came from. The bytes hashed are the bytes the loader read, as it read
// them; only bytes it read out of file order are read again for the hash
// (capturedReaderAt).
func fingerprint(recordFiles []capturedFile, rules []ruleFile, limits []byte, only []string) string {
	h := sha256.New()
	for _, f := range recordFiles {
		// Each records file is framed by its length and its own SHA-256,
		// hashed as it was read, so no copy of a large file is kept.
		fmt.Fprintf(h, "records/%s\x00%d\x00", f.name, f.size)
		h.Write(f.sum)
	}
	for _, r := range rules {
		if strings.HasSuffix(r.path, "_test.rego") {
			continue
		}
		frame(h, "rules:"+r.source+"/"+r.path, r.data)
	}
	frame(h, "limits", limits)
	if len(only) > 0 {
		// A run limited by --only reports fewer findings from the same
		// inputs: it must not share the whole run's fingerprint. (A whole
		// run hashes as before.)
		sel := slices.Clone(only)
		slices.Sort(sel)
		frame(h, "only", []byte(strings.Join(slices.Compact(sel), ",")))
	}
	return hex.EncodeToString(h.Sum(nil))
}

func frame(h hash.Hash, name string, b []byte) {
	fmt.Fprintf(h, "%s\x00%d\x00", name, len(b))
	h.Write(b)
}

// capturedFile is one file as the records loader read it: its length and
// the SHA-256 of its bytes.
type capturedFile struct {
	name string
	size int64
	sum  []byte
}

// captureFS hashes every file read through it, so the fingerprint
// covers exactly the bytes the records were loaded from (a file that
// changes on disk during the check cannot slip past it). Folders are passed
// through; the loader reads files from several goroutines at once.
type captureFS struct {
	fsys    fs.FS
	mu      sync.Mutex
	files   map[string]*capture
	changed []string // files that changed while read in ranges
}

type capture struct {
	h        hash.Hash
	n        int64 // the bytes hashed: the file's first n bytes
	newlines int
	last     byte // the last byte hashed
	complete bool // read to the end
}

// add hashes b, the file's bytes from c.n on.
func (c *capture) add(b []byte) {
	if len(b) == 0 {
		return
	}
	c.h.Write(b)
	c.n += int64(len(b))
	c.newlines += bytes.Count(b, []byte{'\n'})
	c.last = b[len(b)-1]
}

// lines is the number of lines read: the line breaks, and a last line
// without one.
func (c *capture) lines() int {
	if c.n > 0 && c.last != '\n' {
		return c.newlines + 1
	}
	return c.newlines
}

func newCaptureFS(fsys fs.FS) *captureFS {
	return &captureFS{fsys: fsys, files: map[string]*capture{}}
}

func (c *captureFS) Open(name string) (fs.File, error) {
	f, err := c.fsys.Open(name)
	if err != nil {
		return nil, err
	}
	st, err := f.Stat()
	if err != nil || st.IsDir() {
		return f, err
	}
	r := &capturedRead{File: f, fs: c, name: name, c: &capture{h: sha256.New()}}
	if ra, ok := f.(io.ReaderAt); ok {
		// The loader reads a large file in ranges, in parallel, through
		// ReadAt: offer it, so a check reads as fast as validate does.
		return &capturedReaderAt{capturedRead: r, ra: ra, size: st.Size()}, nil
	}
	return r, nil
}

// ReadDir lists a folder without capturing anything.
func (c *captureFS) ReadDir(name string) ([]fs.DirEntry, error) { return fs.ReadDir(c.fsys, name) }

// Stat, Lstat and ReadLink pass through without opening the file, so the
// loader can refuse a named pipe or a link leading out of the folder
// before anything opens it.
func (c *captureFS) Stat(name string) (fs.FileInfo, error)  { return fs.Stat(c.fsys, name) }
func (c *captureFS) Lstat(name string) (fs.FileInfo, error) { return fs.Lstat(c.fsys, name) }
func (c *captureFS) ReadLink(name string) (string, error)   { return fs.ReadLink(c.fsys, name) }

// keep stores a finished read of name: a complete read replaces an earlier
// one; a partial read (a sniff of the first bytes) counts only when the
// file was never read to its end.
func (c *captureFS) keep(name string, cp *capture) {
	c.mu.Lock()
	defer c.mu.Unlock()
	if prev, ok := c.files[name]; !ok || cp.complete || !prev.complete {
		c.files[name] = cp
	}
}

// changedWhileRead notes a file whose bytes differed between two reads.
func (c *captureFS) changedWhileRead(name string) {
	c.mu.Lock()
	defer c.mu.Unlock()
	c.changed = append(c.changed, name)
}

// err is the error of a check whose records changed while they were read:
// the fingerprint could not be tied to the rows judged.
func (c *captureFS) err() error {
	c.mu.Lock()
	defer c.mu.Unlock()
	if len(c.changed) == 0 {
		return nil
	}
	names := slices.Clone(c.changed)
	slices.Sort(names)
	return fmt.Errorf("%s changed while it was read: check again once nothing writes to the records folder", strings.Join(slices.Compact(names), ", "))
}

// lineCounts has, per file read, its number of lines (evidence refs are
// checked against them).
func (c *captureFS) lineCounts() map[string]int {
	c.mu.Lock()
	defer c.mu.Unlock()
	out := make(map[string]int, len(c.files))
	for name, cp := range c.files {
		out[name] = cp.lines()
	}
	return out
}

// read lists the files read, by name.
func (c *captureFS) read() []capturedFile {
	c.mu.Lock()
	defer c.mu.Unlock()
	out := make([]capturedFile, 0, len(c.files))
	for name, cp := range c.files {
		out = append(out, capturedFile{name: name, size: cp.n, sum: cp.h.Sum(nil)})
	}
	sort.Slice(out, func(i, j int) bool { return out[i].name < out[j].name })
	return out
}

// capturedRead is a file read from its start to its end, in order: every
// byte is hashed as it is read, once.
type capturedRead struct {
	fs.File
	fs     *captureFS
	name   string
	c      *capture
	closed bool
}

func (r *capturedRead) Read(p []byte) (int, error) {
	n, err := r.File.Read(p)
	r.c.add(p[:n])
	if err == io.EOF {
		r.c.complete = true
	}
	return n, err
}

func (r *capturedRead) Close() error {
	if !r.closed {
		r.closed = true
		r.fs.keep(r.name, r.c)
	}
	return r.File.Close()
}

// capturedReaderAt is a file the loader may read in ranges, from several
// goroutines at once (records/split.go). SHA-256 takes the bytes in file
// order only, so the capture follows the frontier: a read that reaches
// past the bytes hashed so far, starting at or before their end, has its
// new bytes hashed by the goroutine that read them, while the ranges still
// parse on the others. The loader counts the lines before each later range
// first, then parses that range, so each byte is hashed as it was first
// read and none is read a second time for the hash. Bytes read only out of
// order (a range that ran ahead of the frontier) are read again at Close,
// from the frontier to the end of what the loader read.
//
// The loader itself reads some bytes twice (the first range: its line
// count, then its parse). Such a second read is checked against the bytes
// hashed: a CRC-32C runs along the frontier, noted at the end of each of
// its reads, and a second read continues the CRC noted where it starts;
// where it ends on a noted offset the two must agree. A file that changed
// between the two reads is an error of the check (captureFS.err), not a
// fingerprint of bytes the parse did not see.
type capturedReaderAt struct {
	*capturedRead
	ra   io.ReaderAt
	size int64 // at Open: the ranges end there

	mu      sync.Mutex
	rpos    int64 // the offset of the next Read
	pos     int64 // the frontier: the bytes hashed (c.n, kept under mu)
	hashing bool  // a goroutine is hashing at the frontier
	end     int64 // the end of the furthest read
	ranged  bool  // ReadAt was used
	crc     uint32
	marks   []crcMark    // the frontier's CRC at the end of each of its reads, by offset
	again   []*crcStream // second reads being checked
	changed bool
}

// crcMark is the CRC-32C of a file's first off bytes.
type crcMark struct {
	off int64
	crc uint32
}

// crcStream is a second read of bytes behind the frontier: the CRC-32C of
// the file's first next bytes, if the bytes read again are the same.
type crcStream struct {
	next int64
	crc  uint32
}

var castagnoli = crc32.MakeTable(crc32.Castagnoli)

// maxStreams is the most second reads followed at once (the loader has one
// per range).
const maxStreams = 16

func (r *capturedReaderAt) Read(p []byte) (int, error) {
	n, err := r.File.Read(p)
	r.mu.Lock()
	off := r.rpos
	r.rpos += int64(n)
	r.mu.Unlock()
	r.saw(p[:n], off)
	if err == io.EOF {
		r.mu.Lock()
		if r.pos == r.rpos && !r.hashing {
			r.c.complete = true
		}
		r.mu.Unlock()
	}
	return n, err
}

func (r *capturedReaderAt) ReadAt(p []byte, off int64) (int, error) {
	n, err := r.ra.ReadAt(p, off)
	r.mu.Lock()
	r.ranged = true
	r.mu.Unlock()
	r.saw(p[:n], off)
	return n, err
}

// saw takes b, the bytes at off: what it adds at the frontier is hashed,
// outside the lock so that the other ranges' reads do not wait on it; a
// read wholly behind the frontier is checked against what was hashed.
func (r *capturedReaderAt) saw(b []byte, off int64) {
	if len(b) == 0 {
		return
	}
	end := off + int64(len(b))
	r.mu.Lock()
	r.end = max(r.end, end)
	pos := r.pos
	if end <= pos {
		r.checkAgain(b, off, end)
		r.mu.Unlock()
		return
	}
	if r.hashing || off > pos {
		r.mu.Unlock()
		return
	}
	r.hashing = true
	crc := r.crc
	r.mu.Unlock()
	r.c.add(b[pos-off:])
	crc = crc32.Update(crc, castagnoli, b[pos-off:])
	r.mu.Lock()
	r.pos, r.crc = end, crc
	r.marks = append(r.marks, crcMark{end, crc})
	r.hashing = false
	r.mu.Unlock()
}

// checkAgain checks b, bytes at off read a second time (under r.mu).
func (r *capturedReaderAt) checkAgain(b []byte, off, end int64) {
	var s *crcStream
	for _, t := range r.again {
		if t.next == off {
			s = t
			break
		}
	}
	if s == nil {
		crc, ok := r.markAt(off)
		if !ok {
			return // starts where no CRC was noted: not checked
		}
		s = &crcStream{next: off, crc: crc}
		if len(r.again) == maxStreams {
			r.again = r.again[1:]
		}
		r.again = append(r.again, s)
	}
	s.crc = crc32.Update(s.crc, castagnoli, b)
	s.next = end
	if crc, ok := r.markAt(end); ok && crc != s.crc {
		r.changed = true
	}
}

// markAt is the frontier's CRC of the first off bytes, when noted.
func (r *capturedReaderAt) markAt(off int64) (uint32, bool) {
	if off == 0 {
		return 0, true
	}
	i, ok := slices.BinarySearchFunc(r.marks, off, func(m crcMark, off int64) int { return cmp.Compare(m.off, off) })
	if !ok {
		return 0, false
	}
	return r.marks[i].crc, true
}

func (r *capturedReaderAt) Close() error {
	if r.closed {
		return r.File.Close()
	}
	r.mu.Lock()
	ranged, end, changed := r.ranged, r.end, r.changed
	r.marks, r.again = nil, nil
	r.mu.Unlock()
	if ranged {
		if changed {
			r.fs.changedWhileRead(r.name)
		}
		r.catchUp(end)
		r.c.complete = r.c.n == r.size
	}
	return r.capturedRead.Close()
}

// catchUp hashes the bytes from the frontier to end that were read only
// out of order.
func (r *capturedReaderAt) catchUp(end int64) {
	if r.c.n >= end {
		return
	}
	buf := make([]byte, min(end-r.c.n, 1<<20))
	for r.c.n < end {
		m, err := r.ra.ReadAt(buf[:min(int64(len(buf)), end-r.c.n)], r.c.n)
		r.c.add(buf[:m])
		if err != nil || m == 0 {
			return
		}
	}
}
