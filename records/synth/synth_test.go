package synth_test

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/records/synth"
	"welfare/rules"
)

// TestFindingsEqualPlanted runs the checker with the shipped rules and limits
// on a generated folder (200 animals over 60 days: a hard-cold, a freezing
// and a warm stretch) and requires its findings to be exactly the planted
// list, which the generator builds by construction, not by checking.
func TestFindingsEqualPlanted(t *testing.T) {
	dir := t.TempDir()
	planted, err := synth.Generate(dir, synth.Options{Animals: 200, Days: 60, Seed: 1})
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
