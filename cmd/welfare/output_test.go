package main

import (
	"bytes"
	"context"
	"errors"
	"io"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// Output paths that cannot be written are refused at once, before the
// records are read: exit 2, one line, nothing on stdout.
func TestOutputPathsRefusedBeforeWork(t *testing.T) {
	tmp := t.TempDir()
	missing := filepath.Join(tmp, "no-such-folder", "audit.pdf")
	folder := filepath.Join(tmp, "reports")
	if err := os.Mkdir(folder, 0o755); err != nil {
		t.Fatal(err)
	}
	notFolder := filepath.Join(tmp, "plain-file")
	if err := os.WriteFile(notFolder, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	same := filepath.Join(tmp, "out.txt")
	tests := []struct {
		name string
		args []string
		want string
	}{
		{"folder missing", []string{"check", demoRecords, "--pdf", missing},
			"welfare check: --pdf " + missing + ": folder " + filepath.Dir(missing) + " does not exist\n"},
		{"path is a folder", []string{"check", "--json", folder, demoRecords},
			"welfare check: --json " + folder + ": is a folder; give a file name inside it\n"},
		{"parent is a file", []string{"check", demoRecords, "--csv", filepath.Join(notFolder, "f.csv")},
			"welfare check: --csv " + filepath.Join(notFolder, "f.csv") + ": " + notFolder + " is not a folder\n"},
		{"two outputs on one path", []string{"check", demoRecords, "--json", same, "--csv", same},
			"welfare check: --json and --csv both name " + same + ": give each report its own file\n"},
		// A folder that does not exist is refused even when the records
		// folder does not exist either: the outputs are checked first.
		{"before the records are read", []string{"check", "/nonexistent/records", "--pdf", missing},
			"welfare check: --pdf " + missing + ": folder " + filepath.Dir(missing) + " does not exist\n"},
	}
	if os.Geteuid() != 0 { // root writes anywhere
		ro := filepath.Join(tmp, "read-only")
		if err := os.Mkdir(ro, 0o555); err != nil {
			t.Fatal(err)
		}
		tests = append(tests, struct {
			name string
			args []string
			want string
		}{"folder not writable", []string{"check", demoRecords, "--pdf", filepath.Join(ro, "a.pdf")},
			"welfare check: --pdf " + filepath.Join(ro, "a.pdf") + ": cannot write in folder " + ro + "\n"})
	}
	if runtime.GOOS == "linux" { // /proc takes no new file, even from root
		tests = append(tests, struct {
			name string
			args []string
			want string
		}{"folder not writable, even by root", []string{"check", demoRecords, "--pdf", "/proc/a.pdf"},
			"welfare check: --pdf /proc/a.pdf: cannot write in folder /proc\n"})
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			code, stdout, stderr := runMain(t, tc.args...)
			if code != exitUsage {
				t.Errorf("exit %d, want %d", code, exitUsage)
			}
			if stdout != "" {
				t.Errorf("work was done before the refusal; stdout:\n%s", stdout)
			}
			want := tc.want + "Run 'welfare help check' for usage.\n"
			if diff := cmp.Diff(want, stderr); diff != "" {
				t.Errorf("stderr (-want +got):\n%s", diff)
			}
		})
	}
	entries, _ := os.ReadDir(tmp)
	for _, e := range entries {
		if strings.HasPrefix(e.Name(), ".") {
			t.Errorf("the writability check left %s behind", e.Name())
		}
	}
}

// dirNames lists a folder, hidden files included.
func dirNames(t *testing.T, dir string) []string {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var names []string
	for _, e := range entries {
		names = append(names, e.Name())
	}
	return names
}

func TestWriteFileReplacesWholeOrNotAtAll(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "findings.json")
	if err := os.WriteFile(path, []byte("previous report"), 0o640); err != nil {
		t.Fatal(err)
	}
	// A writer that fails half way, as a full disk does.
	err := writeFile(context.Background(), path, func(w io.Writer) error {
		io.WriteString(w, `{"findings": [`)
		return errors.New("no space left on device")
	})
	if err == nil || !strings.Contains(err.Error(), "no space left on device") {
		t.Errorf("writeFile error = %v, want the writer's error", err)
	}
	if b, _ := os.ReadFile(path); string(b) != "previous report" {
		t.Errorf("a failed write changed the previous file to %q", b)
	}
	if diff := cmp.Diff([]string{"findings.json"}, dirNames(t, dir)); diff != "" {
		t.Errorf("a failed write left files behind (-want +got):\n%s", diff)
	}

	// An interrupted run does not rename its file into place.
	ctx, cancel := context.WithCancel(context.Background())
	err = writeFile(ctx, path, func(w io.Writer) error {
		cancel()
		_, err := io.WriteString(w, "new report")
		return err
	})
	if !errors.Is(err, context.Canceled) {
		t.Errorf("writeFile after cancel = %v, want context.Canceled", err)
	}
	if b, _ := os.ReadFile(path); string(b) != "previous report" {
		t.Errorf("an interrupted write changed the previous file to %q", b)
	}

	// A whole write replaces the file and keeps its mode.
	if err := writeFile(context.Background(), path, func(w io.Writer) error {
		_, err := io.WriteString(w, "new report")
		return err
	}); err != nil {
		t.Fatal(err)
	}
	if b, _ := os.ReadFile(path); string(b) != "new report" {
		t.Errorf("file = %q, want the new report", b)
	}
	if st, _ := os.Stat(path); st.Mode().Perm() != 0o640 {
		t.Errorf("mode = %v, want the previous file's 0640", st.Mode().Perm())
	}
	if diff := cmp.Diff([]string{"findings.json"}, dirNames(t, dir)); diff != "" {
		t.Errorf("files after a whole write (-want +got):\n%s", diff)
	}
	fresh := filepath.Join(dir, "new.csv")
	if err := writeFile(context.Background(), fresh, func(w io.Writer) error { return nil }); err != nil {
		t.Fatal(err)
	}
	if st, _ := os.Stat(fresh); st.Mode().Perm() != 0o644 {
		t.Errorf("a new report's mode = %v, want 0644 (readable, as os.Create makes it)", st.Mode().Perm())
	}
}

// cancelOnWrite is a terminal where the user presses Ctrl-C as the summary
// appears: the context is cancelled on the first write.
type cancelOnWrite struct {
	bytes.Buffer
	cancel context.CancelFunc
}

func (c *cancelOnWrite) Write(p []byte) (int, error) {
	c.cancel()
	return c.Buffer.Write(p)
}

// Ctrl-C during a check: "interrupted", exit 130, and the reports of the
// previous run stay as they were, with no half-written file beside them.
func TestInterruptedCheck(t *testing.T) {
	dir := t.TempDir()
	pdf, js := filepath.Join(dir, "audit.pdf"), filepath.Join(dir, "findings.json")
	for _, p := range []string{pdf, js} {
		if err := os.WriteFile(p, []byte("previous"), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	args := []string{"check", demoRecords, "--from", "2026-01-01", "--to", "2026-01-31", "--pdf", pdf, "--json", js}

	t.Run("during the run", func(t *testing.T) {
		ctx, cancel := context.WithCancel(context.Background())
		defer cancel()
		stdout := &cancelOnWrite{cancel: cancel}
		var stderr bytes.Buffer
		code := exitCode(run(ctx, args, stdout, &stderr), &stderr)
		if code != exitInterrupted || !strings.Contains(stderr.String(), "welfare: interrupted\n") {
			t.Errorf("exit %d, stderr %q; want %d and \"welfare: interrupted\"", code, stderr.String(), exitInterrupted)
		}
		if stdout.Len() == 0 {
			t.Error("the run never reached its summary, so this did not test an interruption mid-run")
		}
	})
	t.Run("before the run", func(t *testing.T) {
		ctx, cancel := context.WithCancel(context.Background())
		cancel()
		var stdout, stderr bytes.Buffer
		code := exitCode(run(ctx, args, &stdout, &stderr), &stderr)
		if code != exitInterrupted || stderr.String() != "welfare: interrupted\n" {
			t.Errorf("exit %d, stderr %q; want %d and only \"welfare: interrupted\"", code, stderr.String(), exitInterrupted)
		}
	})
	for _, p := range []string{pdf, js} {
		if b, _ := os.ReadFile(p); string(b) != "previous" {
			t.Errorf("%s was replaced by an interrupted run", filepath.Base(p))
		}
	}
	if diff := cmp.Diff([]string{"audit.pdf", "findings.json"}, dirNames(t, dir)); diff != "" {
		t.Errorf("an interrupted run left files behind (-want +got):\n%s", diff)
	}
}

type failingWriter struct{}

func (failingWriter) Write([]byte) (int, error) { return 0, errors.New("no space left on device") }

// Results that could not be written to standard output are not a success.
func TestStdoutWriteErrorIsAnError(t *testing.T) {
	for _, args := range [][]string{
		{"limits", "show"},
		{"rules", "list"},
		{"help"},
		{"validate", "--limits", "", demoRecords},
	} {
		t.Run(strings.Join(args, " "), func(t *testing.T) {
			var stderr bytes.Buffer
			code := exitCode(run(context.Background(), args, failingWriter{}, &stderr), &stderr)
			want := "welfare: writing to standard output: no space left on device\n"
			if code != exitUsage || stderr.String() != want {
				t.Errorf("exit %d, stderr %q; want %d and %q", code, stderr.String(), exitUsage, want)
			}
		})
	}
}
