package checker_test

import (
	"context"
	"os"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/rules"
)

// CheckOptions.Released is called once, while the facts are built, when
// the check lets the care rounds go (DropRecords), and never otherwise;
// letting them go changes no finding.
func TestReleasedOnceWithDropRecords(t *testing.T) {
	lim, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	var phase string
	p, err := checker.Compile(context.Background(), lim, []checker.Source{{Name: "rules", FS: rules.FS()}},
		checker.Options{Progress: func(ph string, done int) {
			if done == 0 {
				phase = ph
			}
		}})
	if err != nil {
		t.Fatal(err)
	}
	run := func(drop bool) (*checker.Result, []string) {
		var calls []string
		res, _, err := p.CheckWith(context.Background(), os.DirFS("../testdata/demo/records"), checker.CheckOptions{
			DropRecords: drop, Released: func() { calls = append(calls, phase) }})
		if err != nil {
			t.Fatal(err)
		}
		return res, calls
	}
	kept, calls := run(false)
	if len(calls) != 0 {
		t.Errorf("rounds kept: Released called %d times", len(calls))
	}
	dropped, calls := run(true)
	if diff := cmp.Diff([]string{"facts"}, calls); diff != "" {
		t.Errorf("rounds let go: Released calls by phase (-want +got):\n%s", diff)
	}
	if len(kept.Findings) == 0 {
		t.Fatal("the demo gave no findings")
	}
	if diff := cmp.Diff(kept.Findings, dropped.Findings); diff != "" {
		t.Errorf("findings with the rounds let go (-kept +dropped):\n%s", diff)
	}
}
