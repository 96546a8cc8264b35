package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

const goldenDemo = "../../testdata/golden/demo"

// golden compares got with the golden file name, or rewrites it with -update.
func golden(t *testing.T, name, got string) {
	t.Helper()
	path := filepath.Join(goldenDemo, name)
	if *update {
		if err := os.MkdirAll(goldenDemo, 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, []byte(got), 0o644); err != nil {
			t.Fatal(err)
		}
		return
	}
	want, err := os.ReadFile(path)
	if err != nil {
		t.Fatalf("%v (run: go test ./cmd/welfare -run Golden -update)", err)
	}
	if diff := cmp.Diff(string(want), got); diff != "" {
		t.Errorf("%s differs from the golden file (-want +got):\n%s\nIf the change is intended: go test ./cmd/welfare -run Golden -update", name, diff)
	}
}

// The demo's outputs, byte for byte: the terminal summary and the JSON and
// CSV files `welfare demo` writes, and the morning view of its coldest day.
// The data are invented; what this holds still is the screens and formats.
func TestGoldenDemo(t *testing.T) {
	dir := t.TempDir()
	code, stdout, stderr := runMain(t, "demo", "--generated-at", "2026-02-02T08:00:00Z", dir)
	if code != exitOK {
		t.Fatalf("demo exit %d\n%s%s", code, stdout, stderr)
	}
	golden(t, "summary.txt", strings.ReplaceAll(stdout, dir, "DIR"))
	for _, f := range []string{"findings.json", "findings.csv"} {
		b, err := os.ReadFile(filepath.Join(dir, f))
		if err != nil {
			t.Fatal(err)
		}
		golden(t, f, string(b))
	}

	// 2026-01-10 is the demo's coldest windy day (see TestMorningView), seen whole.
	code, stdout, stderr = runMain(t, "check", "--on", "2026-01-10", demoRecords)
	if code != exitFindings {
		t.Fatalf("morning view exit %d, want %d\n%s%s", code, exitFindings, stdout, stderr)
	}
	golden(t, "morning-2026-01-10.txt", stdout)
}
