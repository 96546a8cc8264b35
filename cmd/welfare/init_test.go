package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// A starter folder validates at once, has every record file with its
// header, and init never overwrites one.
func TestInitThenValidate(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "records")
	code, stdout, stderr := runMain(t, "init", dir)
	if code != exitOK {
		t.Fatalf("init exit %d: %s", code, stderr)
	}
	for _, want := range []string{"Fill in first", "facility.yaml", "welfare validate " + dir, "welfare help records"} {
		if !strings.Contains(stdout, want) {
			t.Errorf("init output lacks %q:\n%s", want, stdout)
		}
	}
	code, stdout, stderr = runMain(t, "validate", dir)
	if code != exitOK {
		t.Fatalf("validate of the starter folder: exit %d\n%s%s", code, stdout, stderr)
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, e := range entries {
		got = append(got, e.Name())
	}
	want := []string{"animals.csv", "corrective_actions.csv", "culls.csv", "daily_care.csv", "deaths.csv", "enclosures.csv", "environment.csv",
		"facility.yaml", "handling.csv", "housing.csv", "litters.csv", "observations.csv", "outdoor_work.csv",
		"ppe_checks.csv", "protocols.csv", "staff.csv", "treatments.csv", "weather.csv"}
	if d := cmp.Diff(want, got); d != "" {
		t.Errorf("files (-want +got):\n%s", d)
	}
	// Required columns first (records.md: animals.csv).
	b, _ := os.ReadFile(filepath.Join(dir, "animals.csv"))
	if !strings.HasPrefix(string(b), "animal_id,species,arrived_on,") {
		t.Errorf("animals.csv header = %q", b)
	}
	if code, _, stderr := runMain(t, "init", dir); code != exitUsage || !strings.Contains(stderr, "already exists") {
		t.Errorf("second init: exit %d, %q; want 2 and 'already exists'", code, stderr)
	}
}

// "welfare help records" prints records/FORMAT.md; with a file, that file's section.
func TestHelpRecords(t *testing.T) {
	format, err := os.ReadFile("../../records/FORMAT.md")
	if err != nil {
		t.Fatal(err)
	}
	code, stdout, _ := runMain(t, "help", "records")
	if code != exitOK || stdout != string(format) {
		t.Errorf("help records: exit %d, output equals FORMAT.md: %v", code, stdout == string(format))
	}
	code, stdout, _ = runMain(t, "help", "records", "weather.csv")
	if code != exitOK || !strings.HasPrefix(stdout, "## weather.csv") || strings.Contains(stdout, "## animals.csv") ||
		!strings.Contains(string(format), stdout) {
		t.Errorf("help records weather.csv: exit %d\n%s", code, stdout)
	}
	if code, _, stderr := runMain(t, "help", "records", "feeding.csv"); code != exitUsage || !strings.Contains(stderr, "not a record file") {
		t.Errorf("help records feeding.csv: exit %d, %s", code, stderr)
	}
}

// validate groups a problem repeated on many rows into one message with
// their lines; the accounting still counts every row.
func TestValidateGroupsRepeatedProblems(t *testing.T) {
	code, stdout, _ := runMain(t, "validate", "../../testdata/exports/decimal-comma")
	if code != exitFindings {
		t.Fatalf("exit %d, want %d", code, exitFindings)
	}
	for _, want := range []string{
		"weather.csv           13         1        12",
		`  weather.csv:2: air_temp_c: "-31,5" has a decimal comma: write -31.5 (numbers use a point)` + "\n    … and 11 more rows like it: lines 3–13\n",
	} {
		if !strings.Contains(stdout, want) {
			t.Errorf("validate output lacks %q:\n%s", want, stdout)
		}
	}
	if strings.Contains(stdout, "weather.csv:3:") {
		t.Errorf("a repeated problem is listed row by row:\n%s", stdout)
	}
}
