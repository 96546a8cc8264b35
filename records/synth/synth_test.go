package synth_test

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/records/synth"
	"welfare/records/synth/review"
	"welfare/reports"
	"welfare/rules"
)

// TestFindingsEqualPlanted runs the checker with the shipped rules and limits
// on generated folders and requires their findings to be exactly the planted
// list, which the generator builds by construction, not by checking. The
// sizes cover the smallest folder, a short winter-to-summer period (a
// hard-cold, a freezing, a warm and a hot stretch in 60 days), and full
// years at one and two plants per kind; -short keeps the small ones.
func TestFindingsEqualPlanted(t *testing.T) {
	for _, tc := range []struct {
		opt   synth.Options
		short bool
	}{
		{synth.Options{Animals: 200, Days: 60, Seed: 1}, true},
		{synth.Options{Animals: synth.MinAnimals, Days: synth.MinDays, Seed: 3}, true},
		{synth.Options{Animals: 400, Days: 90, Seed: 4}, true},
		{synth.Options{Animals: 1000, Days: 365, Seed: 7}, false},
		{synth.Options{Animals: 5000, Days: 60, Seed: 5}, false},
	} {
		t.Run(fmt.Sprintf("animals=%d/days=%d/seed=%d", tc.opt.Animals, tc.opt.Days, tc.opt.Seed), func(t *testing.T) {
			if testing.Short() && !tc.short {
				t.Skip("a year of a large farm: run without -short")
			}
			findingsEqualPlanted(t, tc.opt)
		})
	}
}

func findingsEqualPlanted(t *testing.T, opt synth.Options) {
	dir := t.TempDir()
	opt.Review = review.Write
	planted, err := synth.Generate(dir, opt)
	if err != nil {
		t.Fatal(err)
	}
	var fromFile []synth.Planted
	b, err := os.ReadFile(filepath.Join(dir, synth.PlantedFile))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, &fromFile); err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(planted, fromFile); diff != "" {
		t.Fatalf("PLANTED.json differs from the returned list (-returned +file):\n%s", diff)
	}
	got := check(t, dir, true)
	if diff := cmp.Diff(planted, got); diff != "" {
		t.Errorf("findings with --previous differ from PLANTED.json (-planted +found):\n%s", diff)
	}
	kinds := map[string]bool{}
	for _, p := range planted {
		kinds[p.Check] = true
	}
	for _, c := range policy(t).Checks() {
		if !kinds[c.ID] {
			t.Errorf("no planted instance of %s: add a plant in plant.go", c.ID)
		}
	}
}

// A plain check, without the previous review, finds what PLANTED.json
// lists except the entries marked "needs": "--previous", and reports
// their checks as not evaluated.
func TestFindingsWithoutPrevious(t *testing.T) {
	dir := t.TempDir()
	planted, err := synth.Generate(dir, synth.Options{Animals: 200, Days: 60, Seed: 1, Review: review.Write})
	if err != nil {
		t.Fatal(err)
	}
	var want []synth.Planted
	needs := 0
	for _, p := range planted {
		if p.Needs == synth.NeedsPrevious {
			needs++
			continue
		}
		want = append(want, p)
	}
	if needs == 0 {
		t.Fatalf("nothing planted needs the previous review")
	}
	if diff := cmp.Diff(want, check(t, dir, false)); diff != "" {
		t.Errorf("findings without --previous (-PLANTED.json without the needs entries +found):\n%s", diff)
	}
}

// Without Options.Review the folder has no previous review and nothing
// planted needs one (the benchmarks generate so).
func TestNoReviewNoNeeds(t *testing.T) {
	dir := t.TempDir()
	planted, err := synth.Generate(dir, synth.Options{Animals: 150, Days: 60, Seed: 2})
	if err != nil {
		t.Fatal(err)
	}
	if _, err := os.Stat(filepath.Join(dir, filepath.FromSlash(synth.PreviousFile))); !os.IsNotExist(err) {
		t.Errorf("%s written without Options.Review (%v)", synth.PreviousFile, err)
	}
	for _, p := range planted {
		if p.Needs != "" {
			t.Errorf("planted without a previous review: %+v", p)
		}
	}
	if diff := cmp.Diff(planted, check(t, dir, false)); diff != "" {
		t.Errorf("findings differ from PLANTED.json (-planted +found):\n%s", diff)
	}
}

func TestSameSeedSameBytes(t *testing.T) {
	a, b := t.TempDir(), t.TempDir()
	opt := synth.Options{Animals: 150, Days: 60, Seed: 7, Review: review.Write}
	for _, d := range []string{a, b} {
		if _, err := synth.Generate(d, opt); err != nil {
			t.Fatal(err)
		}
	}
	var files []string
	err := filepath.WalkDir(a, func(path string, d fs.DirEntry, err error) error {
		if err == nil && !d.IsDir() {
			rel, _ := filepath.Rel(a, path)
			files = append(files, rel)
		}
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(files) < 10 || !slices.Contains(files, "corrective_actions.csv") || !slices.Contains(files, filepath.FromSlash(synth.PreviousFile)) {
		t.Fatalf("files written: %v", files)
	}
	for _, name := range files {
		x, _ := os.ReadFile(filepath.Join(a, name))
		y, err := os.ReadFile(filepath.Join(b, name))
		if err != nil || !bytes.Equal(x, y) {
			t.Errorf("%s differs between two runs with the same seed (%v)", name, err)
		}
	}
	c := t.TempDir()
	if _, err := synth.Generate(c, synth.Options{Animals: 150, Days: 60, Seed: 8, Review: review.Write}); err != nil {
		t.Fatal(err)
	}
	x, _ := os.ReadFile(filepath.Join(a, synth.PlantedFile))
	y, _ := os.ReadFile(filepath.Join(c, synth.PlantedFile))
	if bytes.Equal(x, y) {
		t.Errorf("seeds 7 and 8 planted the same list")
	}
}

func TestRejectsSizes(t *testing.T) {
	for _, opt := range []synth.Options{{Animals: 10, Days: 60}, {Animals: 200, Days: 10}, {Animals: 200, Days: 400}} {
		if _, err := synth.Generate(t.TempDir(), opt); err == nil {
			t.Errorf("%+v: no error", opt)
		}
	}
}

func limits(t *testing.T) *rules.Limits {
	t.Helper()
	lim, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	return lim
}

func policy(t *testing.T) *checker.Policy {
	t.Helper()
	p, err := checker.Compile(context.Background(), limits(t), []checker.Source{{Name: "rules", FS: rules.FS()}}, checker.Options{})
	if err != nil {
		t.Fatal(err)
	}
	return p
}

// check runs the shipped rules on dir, with its previous review when
// previous is true, and returns the findings as planted entries (Needs set
// for a check that needs the previous review). A check not evaluated is an
// error, except, without the previous review, one that needs it.
func check(t *testing.T, dir string, previous bool) []synth.Planted {
	t.Helper()
	p := policy(t)
	var opt checker.CheckOptions
	if previous {
		f, err := os.Open(filepath.Join(dir, filepath.FromSlash(synth.PreviousFile)))
		if err != nil {
			t.Fatal(err)
		}
		defer f.Close()
		if opt.Previous, err = reports.ReadFindings(f, synth.PreviousFile); err != nil {
			t.Fatal(err)
		}
	}
	res, _, err := p.CheckWith(context.Background(), os.DirFS(dir), opt)
	if err != nil {
		t.Fatal(err)
	}
	needs := map[string]bool{}
	for _, c := range p.Checks() {
		needs[c.ID] = slices.Contains(c.Needs, synth.NeedsPrevious)
	}
	skipped := map[string]bool{}
	for _, s := range res.NotEvaluated {
		skipped[s.Check] = true
		if previous || !needs[s.Check] {
			t.Errorf("not evaluated: %s (%s)", s.Check, s.Reason)
		}
	}
	for id, n := range needs {
		if n && !previous && !skipped[id] {
			t.Errorf("%s needs the previous review but was evaluated without it", id)
		}
	}
	got := []synth.Planted{}
	for _, f := range res.Findings {
		p := synth.Planted{Check: f.Check, Subject: f.Subject, On: f.On.String()}
		if !f.Until.IsZero() && f.Until != f.On {
			p.Until = f.Until.String()
		}
		if needs[f.Check] {
			p.Needs = synth.NeedsPrevious
		}
		got = append(got, p)
	}
	synth.SortPlanted(got)
	return got
}

// TestFailingFindingsEqualPlanted: the failing farm's findings are exactly
// the list it plants by construction (every day check on every day, every
// run check as one run), with and without a cleaning gap in the period and
// with a freezing, a hard-cold, a warm and a hot stretch.
func TestFailingFindingsEqualPlanted(t *testing.T) {
	for _, opt := range []synth.Options{
		{Animals: synth.MinAnimals, Days: synth.MinFailingDays, Seed: 1, Failing: true},
		{Animals: 160, Days: 40, Seed: 2, Failing: true},
	} {
		t.Run(fmt.Sprintf("animals=%d/days=%d", opt.Animals, opt.Days), func(t *testing.T) {
			dir := t.TempDir()
			planted, err := synth.Generate(dir, opt)
			if err != nil {
				t.Fatal(err)
			}
			if n := synth.FailingFindings(opt.Animals, opt.Days); n != len(planted) {
				t.Errorf("FailingFindings(%d, %d) = %d, planted %d", opt.Animals, opt.Days, n, len(planted))
			}
			if diff := cmp.Diff(planted, check(t, dir, false)); diff != "" {
				t.Errorf("findings differ from PLANTED.json (-planted +found):\n%s", diff)
			}
		})
	}
}

// The failing farm is deterministic with the seed too, and the seed is
// used (the weighings' minutes).
func TestFailingSameSeedSameBytes(t *testing.T) {
	read := func(seed uint64) map[string][]byte {
		dir := t.TempDir()
		if _, err := synth.Generate(dir, synth.Options{Animals: 120, Days: 8, Seed: seed, Failing: true}); err != nil {
			t.Fatal(err)
		}
		out := map[string][]byte{}
		entries, err := os.ReadDir(dir)
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range entries {
			if !e.IsDir() {
				out[e.Name()], _ = os.ReadFile(filepath.Join(dir, e.Name()))
			}
		}
		return out
	}
	a, b, c := read(3), read(3), read(4)
	if len(a) < 10 {
		t.Fatalf("files written: %d", len(a))
	}
	for name, x := range a {
		if !bytes.Equal(x, b[name]) {
			t.Errorf("%s differs between two runs with the same seed", name)
		}
	}
	if bytes.Equal(a["handling.csv"], c["handling.csv"]) {
		t.Errorf("seeds 3 and 4 wrote the same handling.csv")
	}
	if _, err := synth.Generate(t.TempDir(), synth.Options{Animals: 120, Days: synth.MinFailingDays - 1, Failing: true}); err == nil {
		t.Errorf("failing farm of %d days: no error", synth.MinFailingDays-1)
	}
}
