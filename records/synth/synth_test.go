package synth_test

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/records/synth"
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
	got := check(t, dir)
	if diff := cmp.Diff(planted, got); diff != "" {
		t.Errorf("findings differ from PLANTED.json (-planted +found):\n%s", diff)
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

func TestSameSeedSameBytes(t *testing.T) {
	a, b := t.TempDir(), t.TempDir()
	opt := synth.Options{Animals: 150, Days: 60, Seed: 7}
	for _, d := range []string{a, b} {
		if _, err := synth.Generate(d, opt); err != nil {
			t.Fatal(err)
		}
	}
	entries, err := os.ReadDir(a)
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) < 10 {
		t.Fatalf("only %d files written", len(entries))
	}
	for _, e := range entries {
		x, _ := os.ReadFile(filepath.Join(a, e.Name()))
		y, err := os.ReadFile(filepath.Join(b, e.Name()))
		if err != nil || !bytes.Equal(x, y) {
			t.Errorf("%s differs between two runs with the same seed (%v)", e.Name(), err)
		}
	}
	c := t.TempDir()
	if _, err := synth.Generate(c, synth.Options{Animals: 150, Days: 60, Seed: 8}); err != nil {
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

func check(t *testing.T, dir string) []synth.Planted {
	t.Helper()
	res, err := policy(t).Check(context.Background(), os.DirFS(dir), checker.Period{}, nil)
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range res.NotEvaluated {
		t.Errorf("not evaluated: %s (%s)", s.Check, s.Reason)
	}
	got := []synth.Planted{}
	for _, f := range res.Findings {
		p := synth.Planted{Check: f.Check, Subject: f.Subject, On: f.On.String()}
		if !f.Until.IsZero() && f.Until != f.On {
			p.Until = f.Until.String()
		}
		got = append(got, p)
	}
	synth.SortPlanted(got)
	return got
}
