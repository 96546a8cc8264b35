package checker

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"maps"
	"os"
	"path/filepath"
	"slices"
	"testing"

	"welfare/records"
	"welfare/records/demo"
	"welfare/rules"
)

// TestFactsSameDocuments guards work on the speed of the fact builders: a
// change that only makes them cheaper must give the rules the very same
// documents. With WELFARE_FACTS_DUMP=DIR it writes, for both demo seasons
// and a generated year (1,000 animals, 365 days, seed 7), every subject
// document as one JSON line per subject (sorted keys), plus the care
// coverage and weather the report reads; with WELFARE_FACTS_SAME=DIR it
// builds them again and fails on the first line that differs from the ones
// written in DIR by an earlier build. Run the dump on the commit before the
// change and the comparison after it:
//
//	WELFARE_FACTS_DUMP=/tmp/before go test ./checker -run TestFactsSameDocuments
//	WELFARE_FACTS_SAME=/tmp/before go test ./checker -run TestFactsSameDocuments
//
// Without either variable it is skipped: a document change on purpose is
// not a regression, so no copy of the documents lives in the repository.
func TestFactsSameDocuments(t *testing.T) {
	dump, same := os.Getenv("WELFARE_FACTS_DUMP"), os.Getenv("WELFARE_FACTS_SAME")
	if dump == "" && same == "" {
		t.Skip("set WELFARE_FACTS_DUMP or WELFARE_FACTS_SAME to a folder")
	}
	lim, err := rules.Default()
	if err != nil {
		t.Fatal(err)
	}
	sets := map[string]*records.Set{}
	for _, name := range slices.Sorted(maps.Keys(demo.Seasons)) {
		set, err := records.Load(demo.Seasons[name].FS(), records.Options{Species: lim.SpeciesCodes()})
		if err != nil {
			t.Fatal(err)
		}
		sets["demo-"+name] = set
	}
	gen, _ := generatedSet(t, 1000, lim)
	sets["generated-1000"] = gen
	for _, name := range slices.Sorted(maps.Keys(sets)) {
		set := sets[name]
		from, to := recordSpan(set)
		f := newFacts(set, lim, Period{From: from, To: to})
		for _, d := range domains {
			d.facts(f)
		}
		var buf bytes.Buffer
		line := func(label string, v any) {
			b, err := json.Marshal(v)
			if err != nil {
				t.Fatalf("%s %s: %v", name, label, err)
			}
			buf.WriteString(label)
			buf.WriteByte('\t')
			buf.Write(b)
			buf.WriteByte('\n')
		}
		line("coverage", f.coverage)
		line("weather", f.weather)
		for _, kind := range slices.Sorted(maps.Keys(f.docs)) {
			for _, d := range f.inputs(kind) {
				// Lazy sections made: a *lazy marshals as {} and would
				// hide every change to the sections that grow with rows.
				line(kind+" "+fmt.Sprint(d["id"]), resolveDoc(d))
			}
		}
		file := name + ".jsonl"
		if dump != "" {
			if err := os.MkdirAll(dump, 0o755); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(filepath.Join(dump, file), buf.Bytes(), 0o644); err != nil {
				t.Fatal(err)
			}
			continue
		}
		want, err := os.ReadFile(filepath.Join(same, file))
		if err != nil {
			t.Fatal(err)
		}
		if bytes.Equal(want, buf.Bytes()) {
			continue
		}
		ws, gs := bufio.NewScanner(bytes.NewReader(want)), bufio.NewScanner(&buf)
		ws.Buffer(nil, 1<<30)
		gs.Buffer(nil, 1<<30)
		for n := 1; ; n++ {
			wok, gok := ws.Scan(), gs.Scan()
			if !wok && !gok {
				break
			}
			if w, g := ws.Text(), gs.Text(); !wok || !gok || w != g {
				t.Fatalf("%s line %d differs:\nwant %.2000s\n got %.2000s", file, n, w, g)
			}
		}
	}
}
