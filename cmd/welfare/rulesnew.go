package main

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"

	"welfare/records"
	"welfare/rules"
)

// newRulePackage writes a committee's rule package to start from: NAME.rego
// with its METADATA (placeholders that compile), one example rule, and
// NAME_test.rego with a test that passes. It refuses to overwrite a file
// or to take the name of a shipped package.
func newRulePackage(args []string, w io.Writer) error {
	if len(args) < 1 || len(args) > 2 {
		return &usageError{cmd: "rules", msg: "rules new " + countMsg("a NAME and at most one DIR", args)}
	}
	name, dir := args[0], "our-rules"
	if len(args) == 2 {
		dir = args[1]
	}
	if !records.IsCode(name) {
		return &usageError{cmd: "rules", msg: fmt.Sprintf("rules new: %q is not a lower_snake_case name (such as fences or night_rounds)", name)}
	}
	if _, err := fs.Stat(rules.FS(), name+".rego"); err == nil {
		return &usageError{cmd: "rules", msg: fmt.Sprintf("rules new: welfare.%s is a shipped package; choose another name (welfare rules list shows the shipped checks)", name)}
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return err
	}
	files := []struct{ path, text string }{
		{filepath.Join(dir, name+".rego"), scaffoldRule(name)},
		{filepath.Join(dir, name+"_test.rego"), scaffoldTest(name)},
	}
	for _, f := range files {
		if _, err := os.Lstat(f.path); err == nil {
			return fmt.Errorf("%s already exists; nothing written", f.path)
		} else if !errors.Is(err, fs.ErrNotExist) {
			return err
		}
	}
	for _, f := range files {
		if err := os.WriteFile(f.path, []byte(f.text), 0o644); err != nil {
			return err
		}
	}
	fmt.Fprintf(w, "Wrote %s and %s: package welfare.%s with one check, local.%s.duration_missing, and its tests.\n",
		files[0].path, files[1].path, name, name)
	fmt.Fprintf(w, "Edit the METADATA (title, description, severity, source) and the rule; the committee guide is rules/README.md.\n")
	fmt.Fprintf(w, "Then: welfare rules test %s\n", dir)
	fmt.Fprintf(w, "  and welfare check RECORDS --rules %s\n", dir)
	return nil
}

func scaffoldRule(name string) string {
	return strings.NewReplacer("NAME", name).Replace(`# METADATA
# title: NAME (a title for the package)
# description: |
#   What the checks of this package look at, for the committee. The subjects
#   below say which documents it receives as input ('welfare rules input animal'
#   lists an animal's fields).
# scope: package
# custom:
#   subjects: [animal]
package welfare.NAME

# METADATA
# title: Handling without a recorded duration
# description: An example to edit or replace. A handling of the animal whose duration was not recorded.
# custom:
#   id: local.NAME.duration_missing
#   severity: note
#   source: facility choice
#   needs: [handling.csv]
findings contains f if {
	some e in input.handling
	is_null(e.duration_min)
	f := {
		"check": "local.NAME.duration_missing",
		"subject": input.id,
		"on": e.on,
		"message": sprintf("%s at %s by %s: no duration recorded", [e.purpose, e.at, e.staff]),
		"evidence": [e.ref],
	}
}
`)
}

func scaffoldTest(name string) string {
	return strings.NewReplacer("NAME", name).Replace(`package welfare.NAME_test

handling(duration) := {
	"on": "2026-01-10", "at": "2026-01-10 09:00", "ref": "handling.csv:2",
	"staff": "ST-01", "purpose": "weighing", "duration_min": duration,
}

test_no_duration_is_a_finding if {
	fs := data.welfare.NAME.findings with input as {"id": "RF-1", "handling": [handling(null)]}
	count(fs) == 1
	some f in fs
	f.check == "local.NAME.duration_missing"
	f.evidence == ["handling.csv:2"]
}

test_a_duration_is_no_finding if {
	count(data.welfare.NAME.findings) == 0 with input as {"id": "RF-1", "handling": [handling(4)]}
}
`)
}
