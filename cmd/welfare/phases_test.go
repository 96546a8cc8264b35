package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records/synth"
)

// --timings prints one line per step, with a wall time and a peak heap,
// to stderr only; without it (and off a terminal) stderr has neither
// timings nor a progress line.
func TestTimings(t *testing.T) {
	line := regexp.MustCompile(`^  (\S+) +[0-9]+\.[0-9]{3} s +[0-9]+ MiB`)
	tests := []struct {
		args  []string
		steps []string
	}{
		{[]string{"validate", "--timings", demoRecords}, []string{"load", "report", "total"}},
		{[]string{"check", "--timings", "--fail-on", "never", demoRecords},
			[]string{"compile", "load", "facts", "rules", "reports", "total"}},
	}
	for _, tt := range tests {
		code, stdout, stderr := runMain(t, tt.args...)
		if code > 1 {
			t.Fatalf("%v: exit %d\n%s", tt.args, code, stderr)
		}
		var steps []string
		for _, l := range strings.Split(stderr, "\n") {
			if m := line.FindStringSubmatch(l); m != nil {
				steps = append(steps, m[1])
			}
		}
		if diff := cmp.Diff(tt.steps, steps); diff != "" {
			t.Errorf("%v: timing lines (-want +got):\n%s\nstderr:\n%s", tt.args, diff, stderr)
		}
		if strings.Contains(stdout, "timings") {
			t.Errorf("%v: timings on stdout", tt.args)
		}
		// Without --timings, nothing of it.
		_, _, quiet := runMain(t, tt.args[0], "--fail-on", "never", demoRecords)
		if tt.args[0] == "validate" {
			_, _, quiet = runMain(t, "validate", demoRecords)
		}
		if strings.Contains(quiet, "timings") || strings.Contains(quiet, "\r") {
			t.Errorf("%s without --timings wrote timings or a progress line:\n%s", tt.args[0], quiet)
		}
	}
}

// The generated folder's findings are its PLANTED.json, through the command line.
func TestGenerateThenCheck(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "gen")
	if code, _, stderr := runMain(t, "generate", "--animals", "150", "--days", "60", "--seed", "3", dir); code != 0 {
		t.Fatalf("generate: exit %d\n%s", code, stderr)
	}
	out, outPrev := filepath.Join(t.TempDir(), "f.json"), filepath.Join(t.TempDir(), "f-prev.json")
	if code, _, stderr := runMain(t, "check", "--fail-on", "never", "--json", out, dir); code != 0 {
		t.Fatalf("check: exit %d\n%s", code, stderr)
	}
	prev := filepath.Join(dir, filepath.FromSlash(synth.PreviousFile))
	if code, _, stderr := runMain(t, "check", "--fail-on", "never", "--previous", prev, "--json", outPrev, dir); code != 0 {
		t.Fatalf("check --previous: exit %d\n%s", code, stderr)
	}
	type row struct{ Check, Subject, On, Until, Needs string }
	read := func(path string, inner bool) []string {
		b, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		var rows []row
		if inner {
			var doc struct{ Findings []row }
			err = json.Unmarshal(b, &doc)
			rows = doc.Findings
		} else {
			err = json.Unmarshal(b, &rows)
		}
		if err != nil {
			t.Fatal(err)
		}
		var keys []string
		for _, r := range rows {
			keys = append(keys, strings.Join([]string{r.Check, r.Subject, r.On, r.Until, r.Needs}, "|"))
		}
		sort.Strings(keys)
		return keys
	}
	// Without --previous: PLANTED.json but the entries that need it.
	all, plain := read(filepath.Join(dir, "PLANTED.json"), false), []string(nil)
	var needs []string
	for _, k := range all {
		if strings.HasSuffix(k, "|"+synth.NeedsPrevious) {
			needs = append(needs, strings.TrimSuffix(k, synth.NeedsPrevious))
		} else {
			plain = append(plain, k)
		}
	}
	if len(plain) < 30 || len(needs) == 0 {
		t.Fatalf("only %d planted findings, %d of them needing --previous", len(all), len(needs))
	}
	if diff := cmp.Diff(plain, read(out, true)); diff != "" {
		t.Errorf("findings without --previous (-PLANTED.json +check):\n%s", diff)
	}
	// With it: every entry (the needs mark is not in findings.json).
	withPrev := append(append([]string(nil), plain...), needs...)
	sort.Strings(withPrev)
	if diff := cmp.Diff(withPrev, read(outPrev, true)); diff != "" {
		t.Errorf("findings with --previous (-PLANTED.json +check):\n%s", diff)
	}
	if code, _, _ := runMain(t, "generate", "--animals", "5", t.TempDir()); code != 2 {
		t.Errorf("generate --animals 5: exit %d, want 2", code)
	}
	before, err := os.ReadFile(filepath.Join(dir, "animals.csv"))
	if err != nil {
		t.Fatal(err)
	}
	code, _, stderr := runMain(t, "generate", "--seed", "4", dir)
	after, _ := os.ReadFile(filepath.Join(dir, "animals.csv"))
	if code != 2 || !strings.Contains(stderr, "not empty") || string(after) != string(before) {
		t.Errorf("generate into a full folder: exit %d, files changed %v:\n%s", code, string(after) != string(before), stderr)
	}
}
