package checker

import (
	"testing"
	"testing/fstest"
)

func TestFingerprint(t *testing.T) {
	recs := fstest.MapFS{"animals.csv": {Data: []byte("animal_id\nF1\n")}, "facility.yaml": {Data: []byte("name: X\n")}}
	rules := []Source{{Name: "rules", FS: fstest.MapFS{"a.rego": {Data: []byte("package welfare.a")}, "a_test.rego": {Data: []byte("x")}}}}
	base, err := Fingerprint(recs, rules, []byte("limits"))
	if err != nil {
		t.Fatal(err)
	}
	if len(base) != 64 {
		t.Fatalf("fingerprint %q is not a SHA-256 hex digest", base)
	}
	again, _ := Fingerprint(recs, rules, []byte("limits"))
	if again != base {
		t.Error("same inputs gave a different fingerprint")
	}
	changed := []struct {
		name  string
		recs  fstest.MapFS
		rules []Source
		lim   string
	}{
		{"records", fstest.MapFS{"animals.csv": {Data: []byte("animal_id\nF2\n")}, "facility.yaml": recs["facility.yaml"]}, rules, "limits"},
		{"rules", recs, []Source{{Name: "rules", FS: fstest.MapFS{"a.rego": {Data: []byte("package welfare.b")}}}}, "limits"},
		{"limits", recs, rules, "limits2"},
		{"bytes moved between files", fstest.MapFS{"animals.csv": {Data: []byte("animal_id\nF1\nname: X\n")}, "facility.yaml": {Data: []byte("")}}, rules, "limits"},
	}
	for _, tc := range changed {
		t.Run(tc.name, func(t *testing.T) {
			got, _ := Fingerprint(tc.recs, tc.rules, []byte(tc.lim))
			if got == base {
				t.Error("a changed input kept the fingerprint")
			}
		})
	}
	// Files the loader does not read do not change it; a workbook does.
	withNote := fstest.MapFS{"animals.csv": recs["animals.csv"], "facility.yaml": recs["facility.yaml"], "notes.txt": {Data: []byte("x")}, "old/animals.csv": {Data: []byte("x")}}
	if got, _ := Fingerprint(withNote, rules, []byte("limits")); got != base {
		t.Error("a file the loader does not read changed the fingerprint")
	}
	withBook := fstest.MapFS{"animals.csv": recs["animals.csv"], "facility.yaml": recs["facility.yaml"], "weather.xlsx": {Data: []byte("PK")}}
	if got, _ := Fingerprint(withBook, rules, []byte("limits")); got == base {
		t.Error("a workbook did not change the fingerprint")
	}
	// Rule tests do not change findings, so they do not change the fingerprint.
	noTests := []Source{{Name: "rules", FS: fstest.MapFS{"a.rego": {Data: []byte("package welfare.a")}}}}
	if got, _ := Fingerprint(recs, noTests, []byte("limits")); got != base {
		t.Error("a _test.rego file changed the fingerprint")
	}
}
