package checker_test

import (
	"context"
	"io/fs"
	"strings"
	"testing"
	"testing/fstest"

	"welfare/checker"
	"welfare/rules"
)

// TestRuleFileTrustAndLocal: one test of a rule file (is it a shipped file
// as shipped?) decides both whether it may define a shipped package and
// whether its checks are marked local; with the source's Trusted and Local.
func TestRuleFileTrustAndLocal(t *testing.T) {
	data, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	limits, err := data.Data()
	if err != nil {
		t.Fatal(err)
	}
	shipped, err := fs.ReadFile(rules.FS(), "cold.rego")
	if err != nil {
		t.Fatal(err)
	}
	const rule = "d.min_wind_chill_c <= lim.frostbite_wind_chill"
	if !strings.Contains(string(shipped), rule) {
		t.Fatalf("cold.rego no longer compares %q", rule)
	}
	edited := []byte(strings.Replace(string(shipped), rule, "d.min_wind_chill_c < lim.frostbite_wind_chill", 1))
	one := func(b []byte) fstest.MapFS { return fstest.MapFS{"cold.rego": {Data: b}} }
	tests := []struct {
		name      string
		src       checker.Source
		refused   string // the start of the error; "" when it compiles
		wantLocal bool   // every check of the file is local
	}{
		{"shipped file as shipped", checker.Source{Name: "rules", FS: one(shipped)}, "", false},
		{"shipped file under another name", checker.Source{Name: "copy", FS: one(shipped)}, "", false},
		{"shipped file in a rules folder", checker.Source{Name: "ours", FS: one(shipped), Local: true}, "", true},
		{"edited shipped file, trusted", checker.Source{Name: "project", FS: one(edited), Trusted: true}, "", true},
		{"edited shipped file, not trusted", checker.Source{Name: "ours", FS: one(edited), Local: true},
			"ours/cold.rego:", false},
		{"edited shipped file, neither trusted nor local", checker.Source{Name: "copy", FS: one(edited)},
			"copy/cold.rego:", false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			e, err := checker.NewEngine(context.Background(), []checker.Source{tt.src}, limits, checker.EngineOptions{})
			if tt.refused != "" {
				if err == nil || !strings.HasPrefix(err.Error(), tt.refused) || !strings.Contains(err.Error(), "welfare.cold is a shipped package") {
					t.Fatalf("error = %v, want one starting %q that refuses the shipped package", err, tt.refused)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			checks := e.Checks()
			if len(checks) == 0 {
				t.Fatal("no checks")
			}
			for _, c := range checks {
				if c.Local != tt.wantLocal {
					t.Errorf("%s: Local = %v, want %v", c.ID, c.Local, tt.wantLocal)
				}
			}
		})
	}
}
