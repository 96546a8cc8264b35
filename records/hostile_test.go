package records

import (
	"context"
	"errors"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"syscall"
	"testing"
	"testing/fstest"
	"time"

	"github.com/google/go-cmp/cmp"
)

const hostileCareHead = "checked_at,enclosure_id,staff_id,observed,notes\n"

func warningLines(s *Set) []string {
	out := []string{}
	for _, w := range s.Warnings {
		out = append(out, w.String())
	}
	return out
}

// TestRefusedEntries: a named pipe, a device, a folder and a link leading
// outside the folder are refused with a warning and are not read; a link
// inside the folder is read. The fingerprint's list is the same.
func TestRefusedEntries(t *testing.T) {
	fsys := folder(nil)
	fsys[careFile] = &fstest.MapFile{Mode: fs.ModeNamedPipe}
	fsys[handlingFile] = &fstest.MapFile{Mode: fs.ModeDevice | fs.ModeCharDevice}
	fsys[weatherFile] = &fstest.MapFile{Mode: fs.ModeSymlink, Data: []byte("../../etc/passwd")}
	fsys[ppeFile] = &fstest.MapFile{Mode: fs.ModeSymlink, Data: []byte("/etc/passwd")}
	fsys[workFile] = &fstest.MapFile{Mode: fs.ModeDir}
	fsys["old/culls.csv"] = &fstest.MapFile{Data: []byte("culled_at,animal_id,staff_id,method\n")}
	fsys[cullsFile] = &fstest.MapFile{Mode: fs.ModeSymlink, Data: []byte("old/culls.csv")}
	s := mustLoad(t, fsys)
	want := []string{
		`daily_care.csv: is not a regular file (a named pipe), not read`,
		`handling.csv: is not a regular file (a device), not read`,
		`ppe_checks.csv: is a link to "/etc/passwd", outside the records folder, not read (copy the file into the folder)`,
		`weather.csv: is a link to "../../etc/passwd", outside the records folder, not read (copy the file into the folder)`,
		`outdoor_work.csv: is not a regular file (a folder), not read`,
		`old: unknown folder, not read`,
	}
	if d := cmp.Diff(want, warningLines(s)); d != "" {
		t.Errorf("warnings (-want +got):\n%s", d)
	}
	for _, f := range []string{careFile, handlingFile, ppeFile, weatherFile, workFile} {
		if s.Present[f] {
			t.Errorf("%s is present though it was refused", f)
		}
	}
	if !s.Present[cullsFile] {
		t.Errorf("%s, a link inside the folder, was not read", cullsFile)
	}
	wantRead := []string{facilityFile, animalsFile, enclosuresFile, staffFile, cullsFile}
	if d := cmp.Diff(wantRead, FilesRead(fsys)); d != "" {
		t.Errorf("FilesRead (-want +got):\n%s", d)
	}
}

// TestRequiredRefused: a required file that is not a regular file stops the load.
func TestRequiredRefused(t *testing.T) {
	fsys := folder(nil)
	fsys[animalsFile] = &fstest.MapFile{Mode: fs.ModeNamedPipe}
	_, err := Load(fsys, testSpecies)
	if err == nil || err.Error() != "animals.csv: required file is not a regular file (a named pipe), not read" {
		t.Errorf("err = %v", err)
	}
}

// TestOSFolder: on a real folder, a named pipe does not block loading and a
// link to a file outside the folder is not followed.
func TestOSFolder(t *testing.T) {
	dir := t.TempDir()
	outside := t.TempDir()
	for name, data := range baseFiles {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	secret := filepath.Join(outside, "weather.csv")
	if err := os.WriteFile(secret, []byte("observed_at,site_id,air_temp_c\n2026-01-15T07:00,MAST,-40\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Symlink(secret, filepath.Join(dir, weatherFile)); err != nil {
		t.Fatal(err)
	}
	// A relative link that climbs out is refused the same way.
	rel, _ := filepath.Rel(dir, secret)
	if err := os.Symlink(rel, filepath.Join(dir, cullsFile)); err != nil {
		t.Fatal(err)
	}
	if err := syscall.Mkfifo(filepath.Join(dir, careFile), 0o644); err != nil {
		t.Skipf("no named pipes here: %v", err)
	}
	fsys, err := OpenFolder(dir)
	if err != nil {
		t.Fatal(err)
	}
	done := make(chan *Set, 1)
	go func() {
		s, err := Load(fsys, testSpecies)
		if err != nil {
			t.Error(err)
		}
		done <- s
	}()
	var s *Set
	select {
	case s = <-done:
	case <-time.After(20 * time.Second):
		t.Fatal("loading a folder with a named pipe did not finish (blocked on the pipe)")
	}
	if s == nil {
		return
	}
	got := warningLines(s)
	wantPrefix := []string{"daily_care.csv: is not a regular file (a named pipe), not read", "weather.csv: is a link to ", "culls.csv: is a link to "}
	for _, w := range wantPrefix {
		found := false
		for _, g := range got {
			found = found || strings.HasPrefix(g, w)
		}
		if !found {
			t.Errorf("no warning starting %q in %q", w, got)
		}
	}
	if s.Present[weatherFile] || len(s.Weather) != 0 || s.Present[cullsFile] {
		t.Errorf("a file outside the folder was read: %v", s.Present)
	}
}

// TestLineCap: a line over MaxLineBytes stops the file with its line
// number, and none of the file's rows is used.
func TestLineCap(t *testing.T) {
	long := strings.Repeat("x", MaxLineBytes+10)
	care := hostileCareHead + "2026-01-15T07:00,E1,K1,yes,ok\n2026-01-15T08:00,E1,K1,yes," + long + "\n2026-01-15T09:00,E1,K1,yes,ok\n"
	s := mustLoad(t, folder(map[string]string{careFile: care}))
	c, _ := s.Count(careFile)
	want := FileCount{File: careFile, Read: 1, Rejected: 1,
		Failed: "cannot be read: line 3 is longer than the limit of 1 MiB a line: not a records file, or damaged"}
	if d := cmp.Diff(want, c); d != "" {
		t.Errorf("count (-want +got):\n%s", d)
	}
	if s.CareRounds().Len() != 0 {
		t.Errorf("%d rows of a file read in part were used", s.CareRounds().Len())
	}
}

// TestFieldCap: a cell over MaxFieldBytes rejects its row, and the message
// echoes the value shortened with its size.
func TestFieldCap(t *testing.T) {
	long := strings.Repeat("y", MaxFieldBytes+1)
	care := hostileCareHead + "2026-01-15T07:00,E1,K1,yes," + long + "\n2026-01-15T08:00,E1,K1,yes,ok\n"
	s := mustLoad(t, folder(map[string]string{careFile: care}))
	want := []string{`daily_care.csv:2: notes: cell is 66 KB, longer than the limit of 64 KiB a cell`}
	if d := cmp.Diff(want, problemLines(s)); d != "" {
		t.Errorf("problems (-want +got):\n%s", d)
	}
	if v := s.Problems[0].Value; len(v) > 100 || !strings.HasSuffix(v, "…") {
		t.Errorf("value not shortened: %d bytes", len(v))
	}
	if s.CareRounds().Len() != 1 {
		t.Errorf("%d rows accepted, want 1", s.CareRounds().Len())
	}
}

// TestLongValueEchoShortened: a long bad value is echoed by its start and
// its size, not in full.
func TestLongValueEchoShortened(t *testing.T) {
	long := strings.Repeat("frozn", 2000) // 10,000 bytes
	care := "checked_at,enclosure_id,staff_id,observed,water\n2026-01-15T07:00,E1,K1,yes," + long + "\n"
	s := mustLoad(t, folder(map[string]string{careFile: care}))
	want := []string{`daily_care.csv:2: water: "froznfroznfroznfroznfroznfroznfroznfrozn…" (10 KB) is not one of ok, low, empty, frozen, not_checked`}
	if d := cmp.Diff(want, problemLines(s)); d != "" {
		t.Errorf("problems (-want +got):\n%s", d)
	}
}

// sizedFS serves one file whose Stat claims a size (a sparse file, or a
// file that lies) while its content is what it is.
type sizedFS struct {
	fstest.MapFS
	name string
	size int64
}

type sizedFile struct {
	fs.File
	size int64
}

type sizedInfo struct {
	fs.FileInfo
	size int64
}

func (i sizedInfo) Size() int64 { return i.size }

func (f sizedFile) Stat() (fs.FileInfo, error) {
	st, err := f.File.Stat()
	return sizedInfo{st, f.size}, err
}

func (s sizedFS) Open(name string) (fs.File, error) {
	f, err := s.MapFS.Open(name)
	if err != nil || name != s.name {
		return f, err
	}
	return sizedFile{f, s.size}, nil
}

// TestFileSize: a file whose size is over MaxFileBytes is refused at once
// (a sparse file is not read through), and a file's claimed size never
// sizes an allocation.
func TestFileSize(t *testing.T) {
	care := hostileCareHead + "2026-01-15T07:00,E1,K1,yes,ok\n"
	huge := sizedFS{MapFS: folder(map[string]string{careFile: care}), name: careFile, size: 1 << 40}
	start := time.Now()
	s := mustLoad(t, huge)
	if time.Since(start) > 10*time.Second {
		t.Errorf("refusing a 1 TB file took %v", time.Since(start))
	}
	c, _ := s.Count(careFile)
	if want := "cannot be read: is 1099.5 GB, larger than the limit of 512 MiB a file (split it, for example by year)"; c.Failed != want {
		t.Errorf("failed = %q, want %q", c.Failed, want)
	}

	// Just under the cap by its Stat, a few bytes in truth: loading it must
	// not allocate for the claimed size.
	lying := sizedFS{MapFS: folder(map[string]string{careFile: care}), name: careFile, size: MaxFileBytes - 1}
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	s = mustLoad(t, lying)
	runtime.ReadMemStats(&after)
	if s.CareRounds().Len() != 1 {
		t.Fatalf("care rows = %d", s.CareRounds().Len())
	}
	if grew := after.TotalAlloc - before.TotalAlloc; grew > 32<<20 {
		t.Errorf("loading a 100-byte file that claims %d bytes allocated %d MB", lying.size, grew>>20)
	}
}

// TestCappedReader: reading past the cap is an error, not a silent cut.
func TestCappedReader(t *testing.T) {
	for _, tc := range []struct {
		data    string
		limit   int64
		wantErr bool
	}{
		{"0123456789", 10, false},
		{"0123456789x", 10, true},
		{"", 10, false},
	} {
		f, _ := fstest.MapFS{"f": {Data: []byte(tc.data)}}.Open("f")
		c := &capped{f: f, ctx: context.Background(), left: tc.limit, limit: tc.limit}
		b, err := io.ReadAll(c)
		var tl *tooLargeError
		if got := errors.As(err, &tl); got != tc.wantErr {
			t.Errorf("%q cap %d: err = %v", tc.data, tc.limit, err)
		}
		if !tc.wantErr && string(b) != tc.data {
			t.Errorf("%q: read %q", tc.data, b)
		}
	}
}

// endless is a file that never ends: rows of care, one per Read.
type endless struct{ fstest.MapFS }

type endlessFile struct {
	fs.File
	n int
}

func (f *endlessFile) Read(p []byte) (int, error) {
	f.n++
	if f.n == 1 {
		return copy(p, hostileCareHead), nil
	}
	time.Sleep(50 * time.Microsecond)
	return copy(p, "2026-01-15T07:00,E1,K1,yes,ok\n"), nil
}

func (e endless) Open(name string) (fs.File, error) {
	f, err := e.MapFS.Open(name)
	if err != nil || name != careFile {
		return f, err
	}
	return &endlessFile{File: f}, nil
}

// TestLoadCancel: loading stops within a second of the context's end.
func TestLoadCancel(t *testing.T) {
	fsys := endless{folder(map[string]string{careFile: hostileCareHead})}
	ctx, cancel := context.WithCancel(context.Background())
	var cancelled time.Time
	time.AfterFunc(200*time.Millisecond, func() { cancelled = time.Now(); cancel() })
	done := make(chan error, 1)
	var stopped time.Time
	go func() {
		_, err := LoadContext(ctx, fsys, testSpecies)
		stopped = time.Now()
		done <- err
	}()
	select {
	case err := <-done:
		if !errors.Is(err, context.Canceled) {
			t.Errorf("err = %v, want context.Canceled", err)
		}
		<-ctx.Done()
		if late := stopped.Sub(cancelled); late > time.Second {
			t.Errorf("stopped %v after the cancel", late)
		}
	case <-time.After(20 * time.Second):
		t.Fatal("loading did not stop after the context was cancelled")
	}
}

// TestTextCells: invalid UTF-8 and NUL bytes reject the row, positioned at
// the cell's column; the value is shown printable.
func TestTextCells(t *testing.T) {
	care := hostileCareHead +
		"2026-01-15T07:00,E1,K1,yes,caf\xe9 latte\n" + // Windows-1252 é in one cell
		"2026-01-15T08:00,E\x001,K1,yes,ok\n" +
		"2026-01-15T09:00,E1,K1,yes,ok\n"
	s := mustLoad(t, folder(map[string]string{careFile: care}))
	want := []string{
		`daily_care.csv:2: notes: "caf\xE9 latte" is not UTF-8 text: save the file as UTF-8 (it looks like a Windows-1252 or Latin-1 export)`,
		`daily_care.csv:3: enclosure_id: contains a NUL byte (character 2): not text`,
	}
	if d := cmp.Diff(want, problemLines(s)); d != "" {
		t.Errorf("problems (-want +got):\n%s", d)
	}
	if d := cmp.Diff([]string{`caf\xE9 latte`, "E␀1"}, []string{s.Problems[0].Value, s.Problems[1].Value}); d != "" {
		t.Errorf("values (-want +got):\n%s", d)
	}
}

// TestHeaderNotText: a header cell that is not text makes the file unusable.
func TestHeaderNotText(t *testing.T) {
	nul := "checked_at,enclosure_id,staff_id,observed,no\x00tes\n2026-01-15T07:00,E1,K1,yes,ok\n"
	s0 := mustLoad(t, folder(map[string]string{careFile: nul}))
	if len(s0.Problems) != 1 || !strings.Contains(s0.Problems[0].Reason, "column 5 of the header") {
		t.Errorf("NUL in a header cell: problems %v", problemLines(s0))
	}
	care := "checked_at,enclosure_id,staff_id,observed,n\xf6tes\n2026-01-15T07:00,E1,K1,yes,ok\n"
	s := mustLoad(t, folder(map[string]string{careFile: care}))
	want := []string{`daily_care.csv:1: the header row is not UTF-8 text: save the file as UTF-8 (it looks like a Windows-1252 or Latin-1 export); its 1 row is not read`}
	if d := cmp.Diff(want, problemLines(s)); d != "" {
		t.Errorf("problems (-want +got):\n%s", d)
	}
}

// TestUnclosedQuote: a quote that never closes says where it opened and how
// many lines it took in; the rows after it are read, not swallowed.
func TestUnclosedQuote(t *testing.T) {
	tests := []struct {
		name  string
		care  string
		want  []string
		count FileCount
	}{
		{
			name: "never closed",
			care: hostileCareHead +
				"2026-01-15T07:00,E1,K1,yes,ok\n" +
				"2026-01-15T08:00,E1,K1,yes,\"gate left open\n" +
				"2026-01-15T09:00,E1,K1,yes,ok\n" +
				"2026-01-15T10:00,E1,K1,yes,ok\n",
			want:  []string{`daily_care.csv:3: a quote opened on line 3 (character 28) is never closed: it took in 3 lines; the row is rejected and reading resumes on line 4`},
			count: FileCount{File: careFile, Read: 4, Accepted: 3, Rejected: 1},
		},
		{
			name: "closed in the wrong place",
			care: hostileCareHead +
				"2026-01-15T08:00,E1,K1,yes,\"gate\n" +
				"2026-01-15T09:00,E1,K1,yes,a \"b\" c\n" +
				"2026-01-15T10:00,E1,K1,yes,ok\n",
			want: []string{
				`daily_care.csv:2: a quote opened on line 2 (character 28) closes on line 3 (character 30) with more text after it: it took in 2 lines; the row is rejected and reading resumes on line 3`,
				`daily_care.csv:3: bare " in non-quoted-field (line 3, character 30)`,
			},
			count: FileCount{File: careFile, Read: 3, Accepted: 1, Rejected: 2},
		},
		{
			name: "a note over two lines is one row",
			care: hostileCareHead +
				"2026-01-15T08:00,E1,K1,yes,\"gate\n" +
				"fixed\"\n" +
				"2026-01-15T10:00,E1,K1,yes,ok\n",
			want:  []string{},
			count: FileCount{File: careFile, Read: 2, Accepted: 2},
		},
		{
			name: "a quote left open swallows a row's worth of cells",
			care: hostileCareHead +
				"2026-01-15T08:00,E1,K1,yes,\"gate\n" +
				"2026-01-15T09:00,E1,K1,yes\",ok\n",
			want:  []string{`daily_care.csv:2: row has 6 cells but the header has 5 (the row runs from line 2 to line 3: is a quote left open?)`},
			count: FileCount{File: careFile, Read: 1, Rejected: 1},
		},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			s := mustLoad(t, folder(map[string]string{careFile: tc.care}))
			if d := cmp.Diff(tc.want, problemLines(s)); d != "" {
				t.Errorf("problems (-want +got):\n%s", d)
			}
			c, _ := s.Count(careFile)
			if d := cmp.Diff(tc.count, c); d != "" {
				t.Errorf("count (-want +got):\n%s", d)
			}
		})
	}
}

// TestQuoteStillOpen: a quote still open after MaxFieldBytes stops taking
// in lines, so a quote at the top of a long file costs bounded memory.
func TestQuoteStillOpen(t *testing.T) {
	var b strings.Builder
	b.WriteString(hostileCareHead + "2026-01-15T07:00,E1,K1,yes,\"oops\n")
	row := "2026-01-15T08:00,E1,K1,yes,ok\n"
	n := MaxFieldBytes/len(row) + 50
	for range n {
		b.WriteString(row)
	}
	s := mustLoad(t, folder(map[string]string{careFile: b.String()}))
	if len(s.Problems) != 1 || !strings.HasPrefix(s.Problems[0].Reason, "a quote opened on line 2 (character 28) is still open after 64 KiB: it took in ") {
		t.Fatalf("problems = %v", problemLines(s))
	}
	if c, _ := s.Count(careFile); c.Accepted != n || c.Rejected != 1 {
		t.Errorf("count = %v, want %d accepted", c, n)
	}
}

// TestDateWindow: dates before 1950 or more than a year after today reject
// the row; an approval may end up to ten years ahead. Today is fixed.
func TestDateWindow(t *testing.T) {
	opt := testSpecies
	opt.Now = func() time.Time { return time.Date(2026, 3, 1, 12, 0, 0, 0, time.UTC) }
	care := hostileCareHead +
		"1949-12-31T23:00,E1,K1,yes,ok\n" +
		"1950-01-01T07:00,E1,K1,yes,ok\n" +
		"2027-03-01T07:00,E1,K1,yes,ok\n" +
		"2027-03-02T07:00,E1,K1,yes,ok\n"
	prot := "protocol_id,title,approved_on,expires_on\nP1,Winter housing,2026-01-01,2031-01-01\nP2,Late,2026-01-01,2037-01-01\n"
	animals := "animal_id,species,sex,born_on,arrived_on\nA1,vulpes_vulpes,f,1926-04-20,2024-04-20\nA2,vulpes_vulpes,f,2024-04-20,2024-04-20\n"
	s, err := Load(folder(map[string]string{careFile: care, protocolsFile: prot, animalsFile: animals}), opt)
	if err != nil {
		t.Fatal(err)
	}
	want := []string{
		`animals.csv:2: born_on: "1926-04-20" is before 1950, outside the plausible window 1950-01-01 … 2027-03-01 for a record`,
		`protocols.csv:3: expires_on: "2037-01-01" is in the future, outside the plausible window 1950-01-01 … 2036-03-01 for a record`,
		`daily_care.csv:2: checked_at: "1949-12-31T23:00" is before 1950, outside the plausible window 1950-01-01 … 2027-03-01 for a record`,
		`daily_care.csv:5: checked_at: "2027-03-02T07:00" is in the future, outside the plausible window 1950-01-01 … 2027-03-01 for a record`,
	}
	if d := cmp.Diff(want, problemLines(s)); d != "" {
		t.Errorf("problems (-want +got):\n%s", d)
	}
}

// TestWarningsGrouped: many unnamed columns are one warning, not thousands.
func TestWarningsGrouped(t *testing.T) {
	head := "checked_at,enclosure_id,staff_id,observed" + strings.Repeat(",", 2000) + "\n"
	s := mustLoad(t, folder(map[string]string{careFile: head}))
	want := []string{`daily_care.csv: column 5 has no name, column 6 has no name, column 7 has no name and 1997 more: unknown column, not read (2000 times)`}
	if d := cmp.Diff(want, warningLines(s)); d != "" {
		t.Errorf("warnings (-want +got):\n%s", d)
	}
}

func TestShortQuote(t *testing.T) {
	for _, tc := range []struct{ in, want string }{
		{"frozn", `"frozn"`},
		{strings.Repeat("a", 64), `"` + strings.Repeat("a", 64) + `"`},
		{strings.Repeat("a", 50_000_000), `"` + strings.Repeat("a", 40) + `…" (50 MB)`},
		// A cut never splits a character: 39 bytes of a, then é (2 bytes).
		{strings.Repeat("a", 39) + strings.Repeat("é", 20), `"` + strings.Repeat("a", 39) + `…" (79 bytes)`},
	} {
		if got := shortQuote(tc.in); got != tc.want {
			t.Errorf("shortQuote(%d bytes) = %s, want %s", len(tc.in), got, tc.want)
		}
	}
}
