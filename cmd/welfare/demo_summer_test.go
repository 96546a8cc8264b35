package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

const summerRecords = "../../testdata/demo-summer/records"

type findingsDoc struct {
	Findings []struct {
		Check, Subject, On, Until string
	}
	NotEvaluated []struct {
		Check, Reason string
	} `json:"not_evaluated"`
}

func checkJSON(t *testing.T, args ...string) findingsDoc {
	t.Helper()
	jsonPath := filepath.Join(t.TempDir(), "f.json")
	code, _, stderr := runMain(t, append([]string{"check", "--fail-on", "never", "--json", jsonPath}, args...)...)
	if code != 0 {
		t.Fatalf("exit code = %d\nstderr: %s", code, stderr)
	}
	b, err := os.ReadFile(jsonPath)
	if err != nil {
		t.Fatal(err)
	}
	var doc findingsDoc
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	return doc
}

// The summer demo's end-to-end test: every planted warm-season and
// inside-building problem is found, and nothing else.
func TestCheckSummerDemoFindsExactlyThePlantedProblems(t *testing.T) {
	doc := checkJSON(t, "--from", "2026-07-01", "--to", "2026-07-31", summerRecords)
	var got []string
	for _, f := range doc.Findings {
		got = append(got, strings.Join([]string{f.Check, f.Subject, f.On, f.Until}, "|"))
	}
	sort.Strings(got)
	if diff := cmp.Diff(plantedFrom(t, "../../testdata/demo-summer/PLANTED.md"), got); diff != "" {
		t.Errorf("findings differ from testdata/demo-summer/PLANTED.md (-planted +found):\n%s", diff)
	}
	for _, n := range doc.NotEvaluated {
		if strings.HasPrefix(n.Check, "heat.") || strings.HasPrefix(n.Check, "environment.") || n.Check == "care.cleaning.overdue" {
			t.Errorf("%s not evaluated on the summer demo: %s", n.Check, n.Reason)
		}
	}
}

// On the January demo nothing of the warm season fires, and the checks
// whose records are absent (no environment.csv) are listed as not
// evaluated; the heat checks, whose weather.csv is there, are evaluated.
func TestWinterDemoHasNoSummerFindings(t *testing.T) {
	doc := checkJSON(t, "--from", "2026-01-01", "--to", "2026-01-31", demoRecords)
	for _, f := range doc.Findings {
		if strings.HasPrefix(f.Check, "heat.") || strings.HasPrefix(f.Check, "environment.") || f.Check == "care.cleaning.overdue" {
			t.Errorf("January finding of a warm-season check: %+v", f)
		}
	}
	got := map[string]string{}
	for _, n := range doc.NotEvaluated {
		got[n.Check] = n.Reason
	}
	for _, c := range []string{"environment.temperature.out_of_range", "environment.humidity.out_of_range", "environment.ammonia.high"} {
		if want := "no environment.csv in the records folder"; got[c] != want {
			t.Errorf("%s: not evaluated reason %q, want %q", c, got[c], want)
		}
	}
	for _, c := range []string{"heat.danger", "heat.shade.missing", "heat.water.checks_insufficient", "care.cleaning.overdue"} {
		if r, ok := got[c]; ok {
			t.Errorf("%s not evaluated on the January demo (%s), but its records are there", c, r)
		}
	}
}

func TestDemoSeasonSummerRuns(t *testing.T) {
	dir := t.TempDir()
	code, stdout, stderr := runMain(t, "demo", "--season", "summer", dir)
	if code != 0 {
		t.Fatalf("exit code = %d\nstderr: %s", code, stderr)
	}
	if !strings.Contains(stdout, "Period: 2026-07-01 to 2026-07-31") || !strings.Contains(stdout, "heat.danger") {
		t.Errorf("summer demo output:\n%s", stdout)
	}
	if _, err := os.Stat(filepath.Join(dir, "records", "environment.csv")); err != nil {
		t.Errorf("summer demo records: %v", err)
	}
	code, _, stderr = runMain(t, "demo", "--season", "autumn", dir)
	if code != 2 || !strings.Contains(stderr, `--season is winter or summer, not "autumn"`) {
		t.Errorf("--season autumn: exit %d, stderr %q", code, stderr)
	}
}
