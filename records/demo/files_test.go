package demo

import (
	"bytes"
	"encoding/csv"
	"io/fs"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"go.yaml.in/yaml/v3"

	"welfare/records"
)

// requiredColumns are the required columns of each file, from the records
// folder contract (records.md). Alternatives (checked_at or date, a unit
// variant) are listed with "|".
var requiredColumns = map[string][]string{
	"animals.csv":      {"animal_id", "species", "arrived_on"},
	"enclosures.csv":   {"enclosure_id", "building_id", "kind", "height_cm|height_in"},
	"housing.csv":      {"animal_id", "enclosure_id", "moved_in_on"},
	"staff.csv":        {"staff_id", "name", "role"},
	"protocols.csv":    {"protocol_id", "title", "approved_on", "expires_on"},
	"daily_care.csv":   {"checked_at|date", "staff_id", "observed"},
	"handling.csv":     {"handled_at", "animal_id", "staff_id", "purpose"},
	"ppe_checks.csv":   {"checked_on", "item_id", "item", "condition"},
	"weather.csv":      {"observed_at", "site_id", "air_temp_c|air_temp_f"},
	"outdoor_work.csv": {"staff_id", "started_at", "ended_at", "site_id"},
	"culls.csv":        {"culled_at", "animal_id", "staff_id", "reason", "method"},
}

func TestDemoFilesParse(t *testing.T) {
	fsys := FS()
	for name, cols := range requiredColumns {
		t.Run(name, func(t *testing.T) {
			b, err := fs.ReadFile(fsys, name)
			if err != nil {
				t.Fatal(err)
			}
			rows, err := csv.NewReader(bytes.NewReader(b)).ReadAll() // also checks every row has the header's width
			if err != nil {
				t.Fatalf("not RFC 4180 CSV: %v", err)
			}
			if len(rows) < 2 {
				t.Fatalf("%d rows, want a header and data", len(rows))
			}
			header := rows[0]
			for _, want := range cols {
				if !slices.ContainsFunc(strings.Split(want, "|"), func(c string) bool { return slices.Contains(header, c) }) {
					t.Errorf("missing required column %s in %v", want, header)
				}
			}
		})
	}
	t.Run("facility.yaml", func(t *testing.T) {
		b, err := fs.ReadFile(fsys, "facility.yaml")
		if err != nil {
			t.Fatal(err)
		}
		var f records.Facility
		dec := yaml.NewDecoder(bytes.NewReader(b))
		dec.KnownFields(true)
		if err := dec.Decode(&f); err != nil {
			t.Fatal(err)
		}
		if f.Name != "Birchfall Fur Research Station" || f.TimeZone != "America/Winnipeg" {
			t.Errorf("facility = %q in %q, want the invented station in America/Winnipeg", f.Name, f.TimeZone)
		}
		if len(f.Buildings) != 7 || !slices.Equal(f.WeatherSites, []string{"MAST"}) {
			t.Errorf("buildings %d, weather sites %v; want 7 and [MAST]", len(f.Buildings), f.WeatherSites)
		}
	})
	t.Run("every file is known", func(t *testing.T) {
		entries, err := fs.ReadDir(fsys, ".")
		if err != nil {
			t.Fatal(err)
		}
		for _, e := range entries {
			if _, ok := requiredColumns[e.Name()]; !ok && e.Name() != "facility.yaml" {
				t.Errorf("unexpected file %s", e.Name())
			}
		}
		if len(entries) != len(requiredColumns)+1 {
			t.Errorf("%d files, want %d", len(entries), len(requiredColumns)+1)
		}
	})
}

func TestWriteTo(t *testing.T) {
	dir := filepath.Join(t.TempDir(), "new", "demo")
	if err := WriteTo(dir); err != nil {
		t.Fatal(err)
	}
	want, err := fs.ReadFile(FS(), "weather.csv")
	if err != nil {
		t.Fatal(err)
	}
	got, err := os.ReadFile(filepath.Join(dir, "weather.csv"))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, want) {
		t.Error("weather.csv written differs from the embedded file")
	}
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) != len(requiredColumns)+1 {
		t.Errorf("wrote %d files, want %d", len(entries), len(requiredColumns)+1)
	}
}
