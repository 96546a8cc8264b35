package checker

import (
	"bytes"
	"crypto/sha256"
	"fmt"
	"io"
	"io/fs"
	"strings"
	"testing"
	"testing/fstest"

	"github.com/google/go-cmp/cmp"
)

// readAll reads every file of fsys through a captureFS, as the loader does,
// and returns what was captured.
func readAll(t *testing.T, fsys fs.FS) []capturedFile {
	t.Helper()
	c := newCaptureFS(fsys)
	err := fs.WalkDir(c, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		_, err = fs.ReadFile(c, p)
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return c.read()
}

func TestFingerprint(t *testing.T) {
	recs := fstest.MapFS{"animals.csv": {Data: []byte("animal_id\nF1\n")}, "facility.yaml": {Data: []byte("name: X\n")}}
	rules := []ruleFile{{"rules", "a.rego", []byte("package welfare.a")}, {"rules", "a_test.rego", []byte("x")}}
	base := fingerprint(readAll(t, recs), rules, []byte("limits"), nil)
	if len(base) != 64 {
		t.Fatalf("fingerprint %q is not a SHA-256 hex digest", base)
	}
	if again := fingerprint(readAll(t, recs), rules, []byte("limits"), nil); again != base {
		t.Error("same inputs gave a different fingerprint")
	}
	changed := []struct {
		name  string
		recs  fstest.MapFS
		rules []ruleFile
		lim   string
	}{
		{"records", fstest.MapFS{"animals.csv": {Data: []byte("animal_id\nF2\n")}, "facility.yaml": recs["facility.yaml"]}, rules, "limits"},
		{"rules", recs, []ruleFile{{"rules", "a.rego", []byte("package welfare.b")}}, "limits"},
		{"limits", recs, rules, "limits2"},
		{"bytes moved between files", fstest.MapFS{"animals.csv": {Data: []byte("animal_id\nF1\nname: X\n")}, "facility.yaml": {Data: []byte("")}}, rules, "limits"},
	}
	for _, tc := range changed {
		t.Run(tc.name, func(t *testing.T) {
			if got := fingerprint(readAll(t, tc.recs), tc.rules, []byte(tc.lim), nil); got == base {
				t.Error("a changed input kept the fingerprint")
			}
		})
	}
	// A run limited by --only reports fewer findings from the same inputs:
	// its fingerprint differs from the whole run's, and the order of the
	// domains named does not matter.
	cold := fingerprint(readAll(t, recs), rules, []byte("limits"), []string{"cold", "care"})
	if cold == base {
		t.Error("--only kept the whole run's fingerprint")
	}
	if again := fingerprint(readAll(t, recs), rules, []byte("limits"), []string{"care", "cold"}); again != cold {
		t.Error("the order of --only changed the fingerprint")
	}
	// Files the loader does not read do not change it; a workbook does.
	withNote := fstest.MapFS{"animals.csv": recs["animals.csv"], "facility.yaml": recs["facility.yaml"], "notes.txt": {Data: []byte("x")}, "old/animals.csv": {Data: []byte("x")}}
	if got, _ := Fingerprint(withNote, rules, []byte("limits")); got != base {
		t.Error("a file the loader does not read changed the fingerprint")
	}
	withBook := fstest.MapFS{"animals.csv": recs["animals.csv"], "facility.yaml": recs["facility.yaml"], "weather.xlsx": {Data: []byte("PK")}}
	if got, _ := Fingerprint(withBook, rules, []byte("limits")); got == base {
		t.Error("a workbook did not change the fingerprint")
	}
	// Rule tests do not change findings, so they do not change the fingerprint.
	noTests := []ruleFile{{"rules", "a.rego", []byte("package welfare.a")}}
	if got := fingerprint(readAll(t, recs), noTests, []byte("limits"), nil); got != base {
		t.Error("a _test.rego file changed the fingerprint")
	}
}

// TestCaptureFS: the fingerprint covers the bytes read, a complete read
// wins over a sniff of the first bytes, and a file never opened is not in it.
func TestCaptureFS(t *testing.T) {
	fsys := fstest.MapFS{
		"a.csv":     {Data: []byte("animal_id\nF1\n")},
		"notes.txt": {Data: []byte("not a record file")},
	}
	c := newCaptureFS(fsys)
	f, err := c.Open("a.csv")
	if err != nil {
		t.Fatal(err)
	}
	sniff := make([]byte, 4)
	if _, err := io.ReadFull(f, sniff); err != nil {
		t.Fatal(err)
	}
	f.Close()
	if _, err := fs.ReadFile(c, "a.csv"); err != nil {
		t.Fatal(err)
	}
	got := map[string]string{}
	for _, f := range c.read() {
		got[f.name] = fmt.Sprintf("%d %x", f.size, f.sum)
	}
	whole := []byte("animal_id\nF1\n")
	want := map[string]string{"a.csv": fmt.Sprintf("%d %x", len(whole), sha256.Sum256(whole))}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("captured (-want +got):\n%s", diff)
	}
}

// BenchmarkCaptureDailyCare1M reads a daily_care.csv of 1,000,000 rows
// (about 60 MB, rows shaped like the demo's) in the loader's 64 KiB reads:
// through the capturing FS (SHA-256 and the newline count for evidence
// line counts), and each part alone on the same bytes, so the newline
// count's share of the capture can be read off.
func BenchmarkCaptureDailyCare1M(b *testing.B) {
	var buf bytes.Buffer
	buf.WriteString("checked_at,enclosure_id,building_id,staff_id,observed,fed,feed_g,water,water_restored,bedding_added,cleaned,health_concern,concern_animal_id,notes\n")
	for i := range 1_000_000 {
		fmt.Fprintf(&buf, "2026-%02d-%02dT%02d:30,E-%05d,S%d,ST-%02d,yes,yes,480,ok,,yes,,,,\n",
			1+i%12, 1+i%28, 7+8*(i%2), i%10000, i%7, i%20)
	}
	data := buf.Bytes()
	fsys := fstest.MapFS{"daily_care.csv": {Data: data}}
	chunk := make([]byte, 1<<16)
	each := func(b *testing.B, f func([]byte)) {
		b.SetBytes(int64(len(data)))
		for b.Loop() {
			for off := 0; off < len(data); off += len(chunk) {
				f(data[off:min(off+len(chunk), len(data))])
			}
		}
	}
	b.Run("capture", func(b *testing.B) {
		b.SetBytes(int64(len(data)))
		for b.Loop() {
			c := newCaptureFS(fsys)
			f, err := c.Open("daily_care.csv")
			if err != nil {
				b.Fatal(err)
			}
			if _, err := io.CopyBuffer(io.Discard, struct{ io.Reader }{f}, chunk); err != nil {
				b.Fatal(err)
			}
			f.Close()
			if n := c.lineCounts()["daily_care.csv"]; n != 1_000_001 {
				b.Fatalf("%d lines", n)
			}
		}
	})
	b.Run("sha256", func(b *testing.B) {
		h := sha256.New()
		each(b, func(p []byte) { h.Write(p) })
	})
	b.Run("newlines", func(b *testing.B) {
		n := 0
		each(b, func(p []byte) { n += bytes.Count(p, []byte{'\n'}) })
		if n == 0 {
			b.Fatal("no newlines")
		}
	})
}

// TestCaptureRanges: a file read in ranges through ReadAt, from several
// goroutines and in any order (as records/split.go reads a large file),
// gets the fingerprint, size and line count of the same bytes read from
// start to end: the SHA-256 of the file, whatever the order of the reads.
func TestCaptureRanges(t *testing.T) {
	var buf bytes.Buffer
	for i := range 20000 {
		fmt.Fprintf(&buf, "2026-01-%02d,E-%04d,yes\n", 1+i%28, i)
	}
	buf.WriteString("last line without a break")
	data := buf.Bytes()
	size := int64(len(data))
	want := fmt.Sprintf("%d %x", len(data), sha256.Sum256(data))
	wantLines := 20001

	// Each plan is the ranges read, in the order their reads start; the
	// ranges of one plan are read at the same time.
	half, third := size/2, size/3
	plans := map[string][][2]int64{
		"whole":                  {{0, size}},
		"count then two ranges":  {{0, half}, {0, half}, {half, size}},
		"later range first":      {{half, size}, {0, half}},
		"three ranges, overlaps": {{third, 2 * third}, {0, third + 100}, {2*third - 7, size}, {0, third}},
		"a sniff of the middle":  {{half, half + 4096}, {0, size}},
	}
	for name, plan := range plans {
		t.Run(name, func(t *testing.T) {
			c := newCaptureFS(fstest.MapFS{"daily_care.csv": {Data: data}})
			f, err := c.Open("daily_care.csv")
			if err != nil {
				t.Fatal(err)
			}
			ra, ok := f.(io.ReaderAt)
			if !ok {
				t.Fatal("the capture hides ReadAt: the loader cannot read the file in ranges")
			}
			done := make(chan error, len(plan))
			for i, r := range plan {
				go func() {
					// Reads of odd sizes, as a bufio.Reader over the range makes.
					p := make([]byte, 4093+i)
					for off := r[0]; off < r[1]; {
						n, err := ra.ReadAt(p[:min(int64(len(p)), r[1]-off)], off)
						if n > 0 && !bytes.Equal(p[:n], data[off:off+int64(n)]) {
							done <- fmt.Errorf("ReadAt at %d gave other bytes", off)
							return
						}
						off += int64(n)
						if err != nil && off < r[1] {
							done <- err
							return
						}
					}
					done <- nil
				}()
			}
			for range plan {
				if err := <-done; err != nil {
					t.Fatal(err)
				}
			}
			f.Close()
			if err := c.err(); err != nil {
				t.Fatal(err)
			}
			files := c.read()
			if len(files) != 1 {
				t.Fatalf("%d files captured", len(files))
			}
			if got := fmt.Sprintf("%d %x", files[0].size, files[0].sum); got != want {
				t.Errorf("captured %s, want %s", got, want)
			}
			if got := c.lineCounts()["daily_care.csv"]; got != wantLines {
				t.Errorf("%d lines, want %d", got, wantLines)
			}
		})
	}
}

// TestCaptureRangesChanged: bytes the loader reads a second time (the
// first range: its line count, then its parse) are checked against the
// bytes hashed. A file rewritten between the two reads is an error of the
// capture, not a fingerprint of bytes the parse did not see; a file that
// only grew past what was read is not.
func TestCaptureRangesChanged(t *testing.T) {
	row := []byte("2026-01-01,E-0001,yes\n")
	for _, tc := range []struct {
		name    string
		change  func(f *fstest.MapFile)
		wantErr bool
	}{
		{"unchanged", func(*fstest.MapFile) {}, false},
		{"rewritten", func(f *fstest.MapFile) { f.Data[len(row)*500+3] = '7' }, true},
		{"grown", func(f *fstest.MapFile) { f.Data = append(f.Data, row...) }, false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			data := bytes.Repeat(row, 1000)
			fsys := fstest.MapFS{"daily_care.csv": {Data: data}}
			c := newCaptureFS(fsys)
			f, err := c.Open("daily_care.csv")
			if err != nil {
				t.Fatal(err)
			}
			ra := f.(io.ReaderAt)
			size := int64(len(data))
			read := func(chunk int64) {
				p := make([]byte, chunk)
				for off := int64(0); off < size; off += chunk {
					if _, err := ra.ReadAt(p[:min(chunk, size-off)], off); err != nil && err != io.EOF {
						t.Fatal(err)
					}
				}
			}
			read(1 << 10) // the count: hashed
			tc.change(fsys["daily_care.csv"])
			read(333) // the parse: checked
			f.Close()
			err = c.err()
			if tc.wantErr != (err != nil) {
				t.Fatalf("err = %v, want an error: %v", err, tc.wantErr)
			}
			if err != nil && !strings.Contains(err.Error(), "daily_care.csv changed while it was read") {
				t.Errorf("err = %v, want daily_care.csv changed while it was read", err)
			}
			files := c.read()
			if got, want := fmt.Sprintf("%d %x", files[0].size, files[0].sum), fmt.Sprintf("%d %x", len(data), sha256.Sum256(bytes.Repeat(row, 1000))); got != want {
				t.Errorf("captured %s, want the bytes first read: %s", got, want)
			}
		})
	}
	// A file read from start to end alone is hashed as read: no error.
	c := newCaptureFS(fstest.MapFS{"daily_care.csv": {Data: row}})
	if _, err := fs.ReadFile(c, "daily_care.csv"); err != nil {
		t.Fatal(err)
	}
	if err := c.err(); err != nil {
		t.Error(err)
	}
}
