package main

import (
	"encoding/json"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// pdfPages is a PDF's text, page by page (pdftotext, poppler-utils); the
// test skips without it.
func pdfPages(t *testing.T, file string) []string {
	t.Helper()
	if _, err := exec.LookPath("pdftotext"); err != nil {
		t.Skip("pdftotext not installed (apt-get install poppler-utils)")
	}
	out, err := exec.Command("pdftotext", "-raw", file, "-").Output()
	if err != nil {
		t.Fatalf("pdftotext: %v", err)
	}
	pages := strings.Split(string(out), "\f")
	for i, p := range pages {
		pages[i] = strings.Join(strings.Fields(p), " ")
	}
	return pages
}

// scopeRun checks the demo with extra arguments and returns the PDF's
// pages and the JSON report.
func scopeRun(t *testing.T, args ...string) ([]string, map[string]any) {
	t.Helper()
	dir := t.TempDir()
	pdfPath, jsonPath := filepath.Join(dir, "a.pdf"), filepath.Join(dir, "f.json")
	all := append([]string{"check", "--from", "2026-01-01", "--to", "2026-01-31", "--fail-on", "never",
		"--generated-at", "2026-01-31T18:00:00Z", "--pdf", pdfPath, "--json", jsonPath}, args...)
	all = append(all, demoRecords)
	if code, _, stderr := runMain(t, all...); code != exitOK {
		t.Fatalf("exit %d\n%s", code, stderr)
	}
	b, err := os.ReadFile(jsonPath)
	if err != nil {
		t.Fatal(err)
	}
	var doc map[string]any
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	return pdfPages(t, pdfPath), doc
}

// A PDF limited by --only says so on its cover, and its fingerprint is not
// the whole run's: two reports with one fingerprint show the same findings.
func TestOnlyColdCoverAndFingerprint(t *testing.T) {
	whole, wholeDoc := scopeRun(t)
	cold, coldDoc := scopeRun(t, "--only", "cold")
	if !strings.Contains(cold[0], "Checks selected only cold (--only): the findings of every other domain are left out of this report") {
		t.Errorf("the --only cold cover does not say what was filtered:\n%s", cold[0])
	}
	if !strings.Contains(whole[0], "Checks selected all") {
		t.Errorf("the whole run's cover does not say all checks were selected:\n%s", whole[0])
	}
	// The cover: the generation time in the facility's time zone (the demo
	// station keeps America/Winnipeg time), and one box of the values
	// recalled from memory for the committee to verify.
	for _, want := range []string{"Generated 2026-01-31 12:00 -06:00 (America/Winnipeg)",
		"To be verified by the committee:", "[M] AVMA Guidelines for the Euthanasia of Animals (2020): species.*.euthanasia"} {
		if !strings.Contains(whole[0]+" "+whole[1], want) {
			t.Errorf("the cover lacks %q:\n%s", want, whole[0])
		}
	}
	if wholeDoc["fingerprint"] == coldDoc["fingerprint"] {
		t.Errorf("--only cold has the whole run's fingerprint %v", wholeDoc["fingerprint"])
	}
	if got := coldDoc["scope"].(map[string]any)["only"]; !cmp.Equal(got, []any{"cold"}) {
		t.Errorf("JSON scope.only = %v, want [cold]", got)
	}
}

// A limits file holding one change is accepted, laid over the defaults, and
// the report lists the change old → new with its source.
func TestOneChangeLimitsFile(t *testing.T) {
	lim := filepath.Join(t.TempDir(), "ours.yaml")
	src := "care:\n  clean_every_days: 7   # [F] weekly, committee minute 2026-03\nseverity:\n  enclosure.platform.missing: \"off\"\n"
	if err := os.WriteFile(lim, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, stderr := runMain(t, "limits", "check", lim)
	if code != exitOK || !strings.Contains(out, "care.clean_every_days: 14 → 7  [F] weekly, committee minute 2026-03") {
		t.Fatalf("limits check: exit %d\n%s%s", code, out, stderr)
	}
	pages, doc := scopeRun(t, "--limits", lim)
	if !strings.Contains(pages[0], "care.clean_every_days: 14 → 7 [F] weekly, committee minute 2026-03") {
		t.Errorf("the cover does not list the change old → new:\n%s", pages[0])
	}
	if !strings.Contains(pages[0], "Switched off 1 check by the limits (severity: off), not in force: enclosure.platform.missing") {
		t.Errorf("the cover does not list the check switched off:\n%s", pages[0])
	}
	// A check switched off is not listed in force.
	for _, c := range doc["checks"].([]any) {
		if id := c.(map[string]any)["id"]; id == "enclosure.platform.missing" {
			t.Error("enclosure.platform.missing is switched off but listed among the checks in force")
		}
	}
	sc := doc["scope"].(map[string]any)
	if sc["limits_file"] != lim || sc["limits_whole"] != false {
		t.Errorf("scope limits = %v, %v", sc["limits_file"], sc["limits_whole"])
	}
}

// Mistyped limits are refused with their line, by limits check and by check.
func TestMistypedLimitsRefused(t *testing.T) {
	tests := []struct {
		name, src, want string
	}{
		{"misspelt check id", "severity:\n  enclosure.platfrom.missing: \"off\"\n",
			`:2: severity[enclosure.platfrom.missing]: "enclosure.platfrom.missing" is not a check of the rules in force (did you mean enclosure.platform.missing?)`},
		{"misspelt purpose", "handling:\n  max_duration_min:\n    temperment_test: 10\n",
			`:3: handling.max_duration_min[temperment_test]: "temperment_test" is not a handling purpose`},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			lim := filepath.Join(t.TempDir(), "ours.yaml")
			if err := os.WriteFile(lim, []byte(tc.src), 0o644); err != nil {
				t.Fatal(err)
			}
			for _, args := range [][]string{
				{"limits", "check", lim},
				{"check", "--limits", lim, demoRecords},
				{"check", "--limits-replace", lim, demoRecords},
			} {
				code, _, stderr := runMain(t, args...)
				if code != exitUsage {
					t.Errorf("%v: exit %d, want %d", args[:2], code, exitUsage)
				}
				if args[1] == "--limits-replace" {
					continue // a partial file read whole fails earlier, for the missing species
				}
				if !strings.Contains(stderr, lim+tc.want) {
					t.Errorf("%v: stderr = %q, want %q", args[:2], stderr, lim+tc.want)
				}
			}
		})
	}
}

// The terminal summary opens with the scope, and the CSV gets it in a side
// file so that findings.csv stays one header row and one finding per row.
func TestScopeInSummaryAndBesideCSV(t *testing.T) {
	csvPath := filepath.Join(t.TempDir(), "findings.csv")
	code, out, stderr := runMain(t, "check", "--only", "cold", "--fail-on", "never", "--from", "2026-01-01", "--to", "2026-01-31",
		"--csv", csvPath, demoRecords)
	if code != exitOK {
		t.Fatalf("exit %d\n%s", code, stderr)
	}
	head := strings.SplitN(out, "Rows per file", 2)[0]
	if !strings.Contains(head, "Checks selected: only cold (--only)") || !strings.Contains(head, "Switched off: none") {
		t.Errorf("the summary does not open with the scope:\n%s", head)
	}
	side, err := os.ReadFile(strings.TrimSuffix(csvPath, ".csv") + ".scope.txt")
	if err != nil {
		t.Fatal(err)
	}
	for _, want := range []string{"Fingerprint: ", "Checks selected: only cold (--only)", "Limits: the built-in defaults"} {
		if !strings.Contains(string(side), want) {
			t.Errorf("findings.scope.txt lacks %q:\n%s", want, side)
		}
	}
	b, err := os.ReadFile(csvPath)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.HasPrefix(string(b), "severity,check,") {
		t.Errorf("findings.csv does not start with its header row: %q", strings.SplitN(string(b), "\n", 2)[0])
	}
}
