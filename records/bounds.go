package records

import (
	"context"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path"
	"strconv"
	"strings"
	"unicode/utf8"
)

// Limits on what the loader reads. A records folder comes from spreadsheets,
// tablets and hand-typed exports; these bounds keep a damaged or hostile file
// from taking unbounded time or memory, and each is reported with its
// position when it is exceeded. They are far above any real record: a year
// of rounds for 1,000 cages is about 40 MB, a row about 100 bytes.
const (
	// MaxLineBytes caps one physical line of a CSV file. A longer line
	// stops reading the file (it is not a records file, or it is damaged).
	MaxLineBytes = 1 << 20 // 1 MiB
	// MaxFieldBytes caps one cell. A longer cell rejects its row; a quoted
	// cell still open after this many bytes is an unclosed quote.
	MaxFieldBytes = 64 << 10 // 64 KiB
	// MaxFileBytes caps one CSV file. A larger file is not read at all.
	MaxFileBytes = 512 << 20 // 512 MiB
	// MaxFacilityBytes caps facility.yaml, a page of settings.
	MaxFacilityBytes = 1 << 20 // 1 MiB
)

// OpenFolder opens a records folder so that every read stays inside it: a
// link that leads outside the folder cannot be followed (os.Root). The
// folder stays open for the life of the program.
func OpenFolder(dir string) (fs.FS, error) {
	root, err := os.OpenRoot(dir)
	if err != nil {
		return nil, err
	}
	return root.FS(), nil
}

// refusal says why Load does not read name from fsys: it is not a regular
// file (a named pipe, a device, a socket, a folder) or it is a link that
// leads outside the folder. It returns "" for a file Load reads, and
// present=false when there is no such entry.
func refusal(fsys fs.FS, name string) (reason string, present bool) {
	li, err := fs.Lstat(fsys, name)
	if errors.Is(err, fs.ErrNotExist) {
		return "", false
	}
	if err != nil {
		return "cannot be read: " + err.Error(), true
	}
	if li.Mode()&fs.ModeSymlink != 0 {
		target, err := fs.ReadLink(fsys, name)
		if err != nil {
			return "is a link that cannot be read, not read", true
		}
		if path.IsAbs(target) || strings.HasPrefix(target, "/") || !fs.ValidPath(path.Join(path.Dir(name), target)) {
			return fmt.Sprintf("is a link to %s, outside the records folder, not read (copy the file into the folder)", shortQuote(target)), true
		}
		st, err := fs.Stat(fsys, name)
		if err != nil {
			return "is a link that leads nowhere or outside the records folder, not read", true
		}
		li = st
	}
	if !li.Mode().IsRegular() {
		return "is not a regular file (" + modeName(li.Mode()) + "), not read", true
	}
	return "", true
}

func modeName(m fs.FileMode) string {
	switch {
	case m.IsDir():
		return "a folder"
	case m&fs.ModeNamedPipe != 0:
		return "a named pipe"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m&fs.ModeDevice != 0, m&fs.ModeCharDevice != 0:
		return "a device"
	case m&fs.ModeSymlink != 0:
		return "a link"
	}
	return "type " + m.Type().String()
}

// FilesRead lists the record files Load reads from fsys (in the order of
// Files): the known names that are regular files inside the folder. The
// fingerprint covers exactly these.
func FilesRead(fsys fs.FS) []string {
	var out []string
	see := func(name string) {
		if reason, present := refusal(fsys, name); present && reason == "" {
			out = append(out, name)
		}
	}
	for _, name := range Files {
		see(name)
		if kind, ok := strings.CutSuffix(name, ".csv"); ok {
			see(kind + ".xlsx")
		}
	}
	see(workbookFile)
	return out
}

// OpenFile opens one record file the way Load reads it: only a regular file
// inside the folder, and never more than its cap (MaxFacilityBytes for
// facility.yaml, MaxFileBytes for a CSV file); reading past the cap is an
// error. A cancelled ctx stops reading at the next block.
func OpenFile(ctx context.Context, fsys fs.FS, name string) (io.ReadCloser, error) {
	if reason, present := refusal(fsys, name); !present {
		return nil, &fs.PathError{Op: "open", Path: name, Err: fs.ErrNotExist}
	} else if reason != "" {
		return nil, errors.New(reason)
	}
	f, err := fsys.Open(name)
	if err != nil {
		return nil, err
	}
	st, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, err
	}
	if !st.Mode().IsRegular() {
		f.Close()
		return nil, errors.New("is not a regular file (" + modeName(st.Mode()) + "), not read")
	}
	limit := int64(MaxFileBytes)
	if name == facilityFile {
		limit = MaxFacilityBytes
	}
	if st.Size() > limit {
		f.Close()
		return nil, &tooLargeError{size: st.Size(), limit: limit}
	}
	return &capped{f: f, ctx: ctx, left: limit, limit: limit}, nil
}

// tooLargeError is a file over its cap.
type tooLargeError struct {
	size  int64 // -1 when only "more than limit" is known
	limit int64
}

func (e *tooLargeError) Error() string {
	if e.size < 0 {
		return "is larger than the limit of " + capSize(e.limit) + " a file (split it, for example by year)"
	}
	return "is " + byteSize(e.size) + ", larger than the limit of " + capSize(e.limit) + " a file (split it, for example by year)"
}

// capped reads a file up to its cap and stops when the context is done.
type capped struct {
	f     fs.File
	ctx   context.Context
	left  int64
	limit int64
}

func (c *capped) Read(p []byte) (int, error) {
	if err := c.ctx.Err(); err != nil {
		return 0, err
	}
	if c.left <= 0 {
		// One byte more than the cap tells a file at the cap from a larger one.
		var one [1]byte
		if n, _ := c.f.Read(one[:]); n > 0 {
			return 0, &tooLargeError{size: -1, limit: c.limit}
		}
		return 0, io.EOF
	}
	if int64(len(p)) > c.left {
		p = p[:c.left]
	}
	n, err := c.f.Read(p)
	c.left -= int64(n)
	return n, err
}

func (c *capped) Close() error { return c.f.Close() }

// capSize writes a cap in binary units: "64 KiB", "1 MiB".
func capSize(n int64) string {
	switch {
	case n >= 1<<20 && n%(1<<20) == 0:
		return strconv.FormatInt(n>>20, 10) + " MiB"
	case n >= 1<<10 && n%(1<<10) == 0:
		return strconv.FormatInt(n>>10, 10) + " KiB"
	}
	return strconv.FormatInt(n, 10) + " bytes"
}

// byteSize writes a size in decimal units: "812 bytes", "64 KB", "50 MB".
func byteSize(n int64) string {
	switch {
	case n < 1000:
		return strconv.FormatInt(n, 10) + " bytes"
	case n < 1000*1000:
		return strconv.FormatInt((n+500)/1000, 10) + " KB"
	case n < 1000*1000*1000:
		return strconv.FormatInt((n+500_000)/1_000_000, 10) + " MB"
	}
	return strconv.FormatFloat(float64(n)/1e9, 'f', 1, 64) + " GB"
}

// maxEcho is the longest value a message repeats in full.
const maxEcho = 64

// shortQuote quotes a value for a message, shortening a long one to its
// start and its size: "aaaa…" (50 MB).
func shortQuote(s string) string {
	if len(s) <= maxEcho {
		return strconv.Quote(s)
	}
	cut := 40
	for cut > 0 && !utf8.RuneStart(s[cut]) {
		cut--
	}
	return strconv.Quote(s[:cut]+"…") + " (" + byteSize(int64(len(s))) + ")"
}

// shortValue is a long cell cut to its start, for a Problem's Value.
func shortValue(s string) string {
	if len(s) <= maxEcho {
		return s
	}
	cut := 40
	for cut > 0 && !utf8.RuneStart(s[cut]) {
		cut--
	}
	return s[:cut] + "…"
}

// shortenReason replaces a long value quoted in full in a reason by its
// shortened form, and caps the reason itself.
func shortenReason(reason, value string) string {
	for _, v := range []string{value, strings.TrimSpace(value)} {
		if len(v) > maxEcho {
			reason = strings.ReplaceAll(reason, strconv.Quote(v), shortQuote(v))
		}
	}
	if len(reason) > 4*maxEcho+200 {
		cut := 4*maxEcho + 100
		for cut > 0 && !utf8.RuneStart(reason[cut]) {
			cut--
		}
		reason = reason[:cut] + "… (" + byteSize(int64(len(reason))) + " message shortened)"
	}
	return reason
}

// textIssue checks that a cell is text: UTF-8, no NUL byte, within the
// field cap. It returns "" for a good cell.
func textIssue(cell string) string {
	if len(cell) > MaxFieldBytes {
		return fmt.Sprintf("cell is %s, longer than the limit of %s a cell", byteSize(int64(len(cell))), capSize(MaxFieldBytes))
	}
	if i := strings.IndexByte(cell, 0); i >= 0 {
		return fmt.Sprintf("contains a NUL byte (character %d): not text", i+1)
	}
	if !utf8.ValidString(cell) {
		i := 0
		for i < len(cell) {
			r, size := utf8.DecodeRuneInString(cell[i:])
			if r == utf8.RuneError && size <= 1 {
				break
			}
			i += size
		}
		return fmt.Sprintf("is not UTF-8 text (byte 0x%02X at character %d): save the file as UTF-8", cell[i], i+1)
	}
	return ""
}

// printable makes a cell safe to show: invalid bytes become U+FFFD and NUL
// bytes become ␀, shortened.
func printable(s string) string {
	s = shortValue(s)
	s = strings.ToValidUTF8(s, "\uFFFD")
	return strings.Clone(strings.ReplaceAll(s, "\x00", "␀"))
}
