package main

import (
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/rules"
)

// addColumn adds a column to a CSV file: name in the header, value(row)
// in each row (row is the line's text).
func addColumn(t *testing.T, path, name string, value func(row string) string) {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSuffix(string(b), "\n"), "\n")
	for i := range lines {
		if i == 0 {
			lines[i] += "," + name
		} else {
			lines[i] += "," + value(lines[i])
		}
	}
	if err := os.WriteFile(path, []byte(strings.Join(lines, "\n")+"\n"), 0o644); err != nil {
		t.Fatal(err)
	}
}

const localColumnRules = `# METADATA
# title: Local columns
# description: Rules on the committee's own columns.
# scope: package
# custom:
#   subjects: [animal]
package welfare.ours

# METADATA
# title: Tail shorter than the committee's minimum
# description: animals.csv x_tail_length_cm below data.limits.local.min_tail_cm.
# custom:
#   id: local.tail.short
#   severity: note
#   source: facility choice
findings contains f if {
	input.extra.x_tail_length_cm != ""
	to_number(input.extra.x_tail_length_cm) < data.limits.local.min_tail_cm
	f := {"check": "local.tail.short", "subject": input.id, "on": "2026-01-01",
		"message": sprintf("tail %s cm", [input.extra.x_tail_length_cm]), "evidence": [input.ref]}
}

# METADATA
# title: Handled without a muzzle
# description: handling.csv x_muzzle is no.
# custom:
#   id: local.handling.no_muzzle
#   severity: note
#   source: facility choice
findings contains f if {
	some e in input.handling
	e.extra.x_muzzle == "no"
	f := {"check": "local.handling.no_muzzle", "subject": input.id, "on": e.on, "message": "no muzzle", "evidence": [e.ref]}
}
`

// TestLocalColumnRule: columns starting with x_ in animals.csv and
// handling.csv reach a committee's rule with no change to Go (the
// animal's document and the entry of the handling), and a value in the
// limits' local section is what the rule compares with.
func TestLocalColumnRule(t *testing.T) {
	t.Chdir(t.TempDir())
	if code, _, errOut := runMain(t, "demo", "demo"); code != exitOK {
		t.Fatalf("demo: exit %d\n%s", code, errOut)
	}
	addColumn(t, "demo/records/animals.csv", "x_tail_length_cm", func(row string) string {
		switch {
		case strings.HasPrefix(row, "RF-416,"):
			return "28"
		case strings.HasPrefix(row, "RF-101,"):
			return "41"
		}
		return ""
	})
	addColumn(t, "demo/records/handling.csv", "x_muzzle", func(row string) string {
		if strings.HasPrefix(row, "2026-01-06T10:00,RF-108,") {
			return "no"
		}
		return "yes"
	})
	limits := string(rules.DefaultLimits()) + "\nlocal:\n  min_tail_cm: 30   # facility choice\n"
	writeFiles(t, ".", map[string]string{"ours/ours.rego": localColumnRules, "limits.yaml": limits})

	code, out, errOut := runMain(t, "check", "demo/records", "--rules", "ours", "--limits", "limits.yaml", "--json", "f.json", "--fail-on", "never")
	if code != exitOK {
		t.Fatalf("check: exit %d\n%s%s", code, out, errOut)
	}
	if !strings.Contains(out, "NOTE  local.tail.short (local rule)  RF-416  2026-01-01") {
		t.Errorf("the summary does not mark the committee's finding local:\n%s", out)
	}
	if strings.Contains(out+errOut, "x_tail_length_cm") && strings.Contains(out+errOut, "unknown column") {
		t.Errorf("a local column is reported as unknown:\n%s%s", out, errOut)
	}
	b, err := os.ReadFile(filepath.Join("f.json"))
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		Findings []struct {
			Check, Subject, On string
			Local              bool
		}
	}
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	var got []string
	for _, f := range doc.Findings {
		if f.Local != strings.HasPrefix(f.Check, "local.") {
			t.Errorf("%s: local %v in findings.json", f.Check, f.Local)
		}
		if f.Local {
			got = append(got, f.Check+" "+f.Subject+" "+f.On)
		}
	}
	slices.Sort(got)
	want := []string{"local.handling.no_muzzle RF-108 2026-01-06", "local.tail.short RF-416 2026-01-01"}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("local findings (-want +got):\n%s", diff)
	}
	// --explain shows the local column as the rule saw it.
	if code, out, _ := runMain(t, "check", "demo/records", "--rules", "ours", "--limits", "limits.yaml", "--explain", "local.tail.short RF-416 2026-01-01"); code != exitOK ||
		!strings.Contains(out, `"x_tail_length_cm": "28"`) {
		t.Errorf("--explain does not show the local column:\n%s", out)
	}
}
