package records

import (
	"bytes"
	"flag"
	"os"
	"reflect"
	"strings"
	"testing"

	"github.com/google/go-cmp/cmp"
)

var update = flag.Bool("update", false, "rewrite records/FORMAT.md from the loader's tables")

// FORMAT.md is the reference generated from the loader's own tables; it
// fails when stale (regenerate with go test ./records -run TestFormatReference -update).
func TestFormatReference(t *testing.T) {
	var b bytes.Buffer
	if err := WriteReference(&b, ""); err != nil {
		t.Fatal(err)
	}
	if *update {
		if err := os.WriteFile("FORMAT.md", b.Bytes(), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	have, err := os.ReadFile("FORMAT.md")
	if err != nil {
		t.Fatal(err)
	}
	if d := cmp.Diff(string(have), b.String()); d != "" {
		t.Errorf("records/FORMAT.md is stale; run go test ./records -run TestFormatReference -update (-file +generated):\n%s", d)
	}
}

// Every file the loader reads, and every column of its row type with each
// unit alternative, is in the reference.
func TestFormatReferenceListsEveryFileAndColumn(t *testing.T) {
	var b bytes.Buffer
	if err := WriteReference(&b, ""); err != nil {
		t.Fatal(err)
	}
	ref := b.String()
	if d := cmp.Diff(Files, ReferenceFiles()); d != "" {
		t.Errorf("reference files differ from the loader's (-loader +reference):\n%s", d)
	}
	for _, k := range kindDocs {
		if !strings.Contains(ref, "## "+k.file+" (") {
			t.Errorf("no section for %s", k.file)
		}
		rt, err := rowTypeOf(k.typ)
		if err != nil {
			t.Fatal(err)
		}
		var sec bytes.Buffer
		if err := WriteReference(&sec, k.file); err != nil {
			t.Fatal(err)
		}
		for i := range rt.fields {
			f := &rt.fields[i]
			names := []string{f.name}
			if f.unit != "" {
				names = nil
				for _, a := range units[f.unit] {
					names = append(names, f.name+a.suffix)
				}
			}
			for _, n := range names {
				if !strings.Contains(sec.String(), n) {
					t.Errorf("%s: column %s is not in its reference", k.file, n)
				}
			}
		}
	}
	for _, name := range []string{"name", "time_zone", "buildings", "buildings[].id", "buildings[].exposure", "buildings[].weather_site", "weather_sites"} {
		if !strings.Contains(ref, "| "+name+" |") {
			t.Errorf("facility.yaml key %s is not in the reference", name)
		}
	}
	// The loader's row types are the ones documented.
	got := map[reflect.Type]bool{}
	for _, k := range kindDocs {
		got[k.typ] = true
	}
	if len(got) != len(Files)-1 {
		t.Errorf("%d row types documented for %d record files", len(got), len(Files)-1)
	}
}

func TestHeaderPutsRequiredColumnsFirst(t *testing.T) {
	tests := []struct {
		file string
		want []string
	}{
		{"weather.csv", []string{"observed_at", "site_id", "air_temp_c", "wind_kmh", "humidity_pct"}},
		{"daily_care", []string{"checked_at", "enclosure_id", "staff_id", "observed", "date", "building_id", "fed", "feed_g", "water",
			"water_restored", "bedding_added", "cleaned", "health_concern", "concern_animal_id", "notes"}},
	}
	for _, tt := range tests {
		got, err := Header(tt.file)
		if err != nil {
			t.Fatal(err)
		}
		if d := cmp.Diff(tt.want, got); d != "" {
			t.Errorf("%s header (-want +got):\n%s", tt.file, d)
		}
	}
	if _, err := Header("feeding.csv"); err == nil {
		t.Error("Header(feeding.csv) gives no error")
	}
}
