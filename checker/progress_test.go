package checker

import (
	"bytes"
	"context"
	"os"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
	"welfare/records/synth"
	"welfare/rules"
)

// Config.Progress hears "facts" then "rules" with growing counts that end
// at the number of subjects evaluated, and does not change the findings.
func TestCheckReportsProgress(t *testing.T) {
	dir := t.TempDir()
	if _, err := synth.Generate(dir, synth.Options{Animals: 100, Days: 60, Seed: 2}); err != nil {
		t.Fatal(err)
	}
	lim, err := rules.LoadLimits(bytes.NewReader(rules.DefaultLimits()), "limits.yaml")
	if err != nil {
		t.Fatal(err)
	}
	data, err := lim.Data()
	if err != nil {
		t.Fatal(err)
	}
	set, err := records.Load(os.DirFS(dir), records.Options{Species: lim.SpeciesCodes()})
	if err != nil {
		t.Fatal(err)
	}
	ctx := context.Background()
	engine, err := NewEngine(ctx, []Source{{Name: "rules", FS: rules.FS()}}, data, EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	quiet, err := Check(ctx, Config{Records: set, Limits: lim, Engine: engine})
	if err != nil {
		t.Fatal(err)
	}
	type call struct {
		phase string
		done  int
	}
	var calls []call
	res, err := Check(ctx, Config{Records: set, Limits: lim, Engine: engine,
		Progress: func(phase string, done int) { calls = append(calls, call{phase, done}) }})
	if err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(quiet.Findings, res.Findings); diff != "" {
		t.Errorf("findings change with Progress (-without +with):\n%s", diff)
	}
	if len(calls) < 3 || calls[0] != (call{"facts", 0}) || calls[1] != (call{"rules", 0}) {
		t.Fatalf("calls %v: want facts 0, rules 0, then rules counts", calls)
	}
	// Subjects: every enclosure, animal, staff member, item, protocol and site.
	subjects := len(set.Enclosures) + len(set.Animals) + len(set.Staff) + len(set.Protocols) + 1
	last := calls[len(calls)-1]
	for i := 2; i < len(calls); i++ {
		if calls[i].phase != "rules" || calls[i].done <= calls[i-1].done {
			t.Errorf("call %d: %v after %v", i, calls[i], calls[i-1])
		}
	}
	if last.done < subjects {
		t.Errorf("last count %d, fewer than the %d subjects", last.done, subjects)
	}
}
