package main

import (
	"bytes"
	"encoding/csv"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"welfare/rules"
)

// quietRules is a committee folder whose one check never fires.
func quietRules(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	src := `# METADATA
# title: Quiet
# description: A committee package that finds nothing.
# scope: package
# custom:
#   subjects: [enclosure]
package welfare.quiet

# METADATA
# title: Never
# description: Never fires.
# custom:
#   id: quiet.never.fires
#   severity: significant
#   source: facility choice
findings contains f if {
	input.id == "no such enclosure"
	f := {"check": "quiet.never.fires", "subject": input.id, "on": "2026-01-01", "message": "m", "evidence": []}
}
`
	if err := os.WriteFile(filepath.Join(dir, "quiet.rego"), []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	return dir
}

// TestRejectedRowsCannotBeFilteredAway: the demo's five rejected rows
// (testdata/demo/PLANTED.md) are in the JSON and CSV of every run, and the
// run exits 1 under the default --fail-on even when nothing else is found,
// whatever --only, --rules-only or a severity override say; only
// --fail-on never exits 0.
func TestRejectedRowsCannotBeFilteredAway(t *testing.T) {
	quiet := quietRules(t)
	off := filepath.Join(t.TempDir(), "limits.yaml")
	text := bytes.Replace(rules.DefaultLimits(), []byte("\nseverity: {}\n"), []byte("\nseverity: {records.row.rejected: \"off\"}\n"), 1)
	if err := os.WriteFile(off, text, 0o644); err != nil {
		t.Fatal(err)
	}
	tests := []struct {
		name string
		args []string
		code int
	}{
		{"only a committee's rules", []string{"--rules-only", "--rules", quiet}, exitFindings},
		{"only a quiet domain", []string{"--rules", quiet, "--only", "quiet"}, exitFindings},
		{"severity off", []string{"--rules", quiet, "--only", "quiet", "--limits", off}, exitFindings},
		{"fail on never", []string{"--rules-only", "--rules", quiet, "--fail-on", "never"}, exitOK},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			out := t.TempDir()
			jsonPath, csvPath := filepath.Join(out, "f.json"), filepath.Join(out, "f.csv")
			args := append([]string{"check", demoRecords, "--json", jsonPath, "--csv", csvPath}, tt.args...)
			code, stdout, stderr := runMain(t, args...)
			if code != tt.code {
				t.Fatalf("exit %d, want %d\n%s%s", code, tt.code, stdout, stderr)
			}
			if tt.code == exitFindings && !strings.Contains(stderr, "exit 1: 5 rows were rejected") {
				t.Errorf("stderr does not say why the run failed:\n%s", stderr)
			}
			b, err := os.ReadFile(jsonPath)
			if err != nil {
				t.Fatal(err)
			}
			var doc struct {
				Findings []struct{ Check, Subject string }
			}
			if err := json.Unmarshal(b, &doc); err != nil {
				t.Fatal(err)
			}
			var inJSON []string
			for _, f := range doc.Findings {
				if f.Check == "records.row.rejected" {
					inJSON = append(inJSON, f.Subject)
				}
			}
			if len(inJSON) != 5 {
				t.Errorf("findings.json lists %d rejected rows, want the demo's 5: %v", len(inJSON), inJSON)
			}
			f, err := os.Open(csvPath)
			if err != nil {
				t.Fatal(err)
			}
			defer f.Close()
			rows, err := csv.NewReader(f).ReadAll()
			if err != nil {
				t.Fatal(err)
			}
			inCSV := 0
			for _, r := range rows {
				if len(r) > 1 && r[1] == "records.row.rejected" {
					inCSV++
				}
			}
			if inCSV != 5 {
				t.Errorf("findings.csv lists %d rejected rows, want 5", inCSV)
			}
		})
	}
}

// TestCommitteePackageContained: the command refuses a --rules folder that
// adds to a shipped package, with the file, row and column, and exit 2.
func TestCommitteePackageContained(t *testing.T) {
	dir := t.TempDir()
	src := "package limits\n\ncold := {\"frostbite_wind_chill_c\": -60}\n"
	if err := os.WriteFile(filepath.Join(dir, "limits.rego"), []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	code, _, stderr := runMain(t, "check", "--rules", dir, demoRecords)
	want := filepath.Join(dir, "limits.rego") + ":1:1: package limits is refused"
	if code != exitUsage || !strings.Contains(stderr, want) {
		t.Errorf("exit %d, want %d and %q in:\n%s", code, exitUsage, want, stderr)
	}
}
