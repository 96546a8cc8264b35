package checker

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"hash"
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
// it came from. The bytes hashed are the bytes read: nothing is read twice.
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
	fsys  fs.FS
	mu    sync.Mutex
	files map[string]*capture
}

type capture struct {
	h        hash.Hash
	n        int64
	newlines int
	last     byte // the last byte read
	complete bool // read to the end
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
	return &capturedRead{File: f, fs: c, name: name, c: &capture{h: sha256.New()}}, nil
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

type capturedRead struct {
	fs.File
	fs     *captureFS
	name   string
	c      *capture
	closed bool
}

func (r *capturedRead) Read(p []byte) (int, error) {
	n, err := r.File.Read(p)
	r.c.h.Write(p[:n])
	r.c.n += int64(n)
	if n > 0 {
		r.c.newlines += bytes.Count(p[:n], []byte{'\n'})
		r.c.last = p[n-1]
	}
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
