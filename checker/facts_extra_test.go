package checker

import (
	"fmt"
	"io/fs"
	"strings"
	"testing"
	"testing/fstest"

	"github.com/google/go-cmp/cmp"

	"welfare/records"
	"welfare/records/demo"
	"welfare/rules"
)

// withLocalColumn copies a records folder, adding a local column x_line to
// every CSV file whose cell is "FILE:LINE" of its own row.
func withLocalColumn(t *testing.T, src fs.FS) fstest.MapFS {
	t.Helper()
	out := fstest.MapFS{}
	err := fs.WalkDir(src, ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		b, err := fs.ReadFile(src, p)
		if err != nil {
			return err
		}
		if strings.HasSuffix(p, ".csv") {
			lines := strings.Split(strings.TrimSuffix(string(b), "\n"), "\n")
			for i := range lines {
				cell := fmt.Sprintf("%s:%d", p, i+1)
				if i == 0 {
					cell = "X_Line" // any case, as every column
				}
				lines[i] += "," + cell
			}
			b = []byte(strings.Join(lines, "\n") + "\n")
		}
		out[p] = &fstest.MapFile{Data: b}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// TestLocalColumns: an x_ column of any records file is no warning and
// reaches the input of the subject or event its row belongs to, as text;
// the documents still match the input schemas.
func TestLocalColumns(t *testing.T) {
	lim, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	set, err := records.Load(withLocalColumn(t, demo.Seasons["winter"].FS()), records.Options{Species: lim.SpeciesCodes()})
	if err != nil {
		t.Fatal(err)
	}
	for _, w := range set.Warnings {
		t.Errorf("warning for a local column: %v", w)
	}
	// The demo's planted rejected rows stay rejected, and carry nothing.
	plain, err := records.Load(demo.Seasons["winter"].FS(), records.Options{Species: lim.SpeciesCodes()})
	if err != nil {
		t.Fatal(err)
	}
	if len(set.Problems) != len(plain.Problems) {
		t.Errorf("%d problems with the local column, %d without: %v", len(set.Problems), len(plain.Problems), set.Problems)
	}
	rejected := map[string]bool{}
	for _, p := range set.Problems {
		rejected[fmt.Sprintf("%s:%d", p.File, p.Line)] = true
	}
	from, to := recordSpan(set)
	f := newFacts(set, lim, Period{From: from, To: to})
	for _, d := range domains {
		d.facts(f)
	}
	f.addExtra()

	// Every object with the ref of a row carries that row's own cell.
	carried, missing := 0, 0
	var walk func(v any)
	walk = func(v any) {
		switch x := v.(type) {
		case map[string]any:
			if ref, ok := x["ref"].(string); ok && strings.Contains(ref, ".csv:") && !rejected[ref] {
				if e, ok := x["extra"].(map[string]any); ok && e["x_line"] == ref {
					carried++
				} else {
					missing++
					t.Errorf("%s: extra %v", ref, x["extra"])
				}
			}
			for k, e := range x {
				if k != "extra" {
					walk(e)
				}
			}
		case []any:
			for _, e := range x {
				walk(e)
			}
		case []map[string]any:
			for _, e := range x {
				walk(e)
			}
		}
	}
	for _, kind := range SubjectKinds {
		s, err := rules.InputSchema(kind)
		if err != nil {
			t.Fatal(err)
		}
		for _, d := range resolveDocs(f.inputs(kind)) {
			walk(d)
			for _, p := range s.Validate(d) {
				t.Errorf("%s %v: %s", kind, d["id"], p)
			}
		}
	}
	if carried == 0 || missing > 0 {
		t.Errorf("%d objects carry their row's local column, %d do not", carried, missing)
	}

	// The places named in the committee guide: the animal's own row on
	// its document, a weighing (observations.csv) on its weights entry.
	rf416 := f.docs["animal"]["RF-416"]
	got := map[string]any{"animal": rf416["extra"]}
	for _, w := range section(rf416, "weights").([]any) {
		got["weight "+w.(map[string]any)["ref"].(string)] = w.(map[string]any)["extra"]
	}
	want := map[string]any{
		"animal":                     map[string]any{"x_line": rf416["ref"]},
		"weight observations.csv:31": map[string]any{"x_line": "observations.csv:31"},
		"weight observations.csv:32": map[string]any{"x_line": "observations.csv:32"},
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("RF-416 (-want +got):\n%s", diff)
	}
}
