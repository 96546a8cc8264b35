package synth_test

import (
	"bytes"
	"context"
	"encoding/csv"
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"github.com/google/go-cmp/cmp"

	"welfare/checker"
	"welfare/checker/heat"
	"welfare/records"
	"welfare/records/synth"
	"welfare/rules"
)

// TestFindingsEqualPlanted runs the checker with the shipped rules and limits
// on generated folders and requires their findings to be exactly the planted
// list, which the generator builds by construction, not by checking. The
// sizes cover the smallest folder, a short winter-to-summer period (a
// hard-cold, a freezing, a warm and a hot stretch in 60 days), and full
// years at one and two plants per kind; -short keeps the small ones.
func TestFindingsEqualPlanted(t *testing.T) {
	for _, tc := range []struct {
		opt   synth.Options
		short bool
	}{
		{synth.Options{Animals: 200, Days: 60, Seed: 1}, true},
		{synth.Options{Animals: synth.MinAnimals, Days: synth.MinDays, Seed: 3}, true},
		{synth.Options{Animals: 400, Days: 90, Seed: 4}, true},
		{synth.Options{Animals: 1000, Days: 365, Seed: 7}, false},
		{synth.Options{Animals: 5000, Days: 60, Seed: 5}, false},
	} {
		t.Run(fmt.Sprintf("animals=%d/days=%d/seed=%d", tc.opt.Animals, tc.opt.Days, tc.opt.Seed), func(t *testing.T) {
			if testing.Short() && !tc.short {
				t.Skip("a year of a large farm: run without -short")
			}
			findingsEqualPlanted(t, tc.opt)
		})
	}
}

func findingsEqualPlanted(t *testing.T, opt synth.Options) {
	dir := t.TempDir()
	planted, err := synth.Generate(dir, opt)
	if err != nil {
		t.Fatal(err)
	}
	var fromFile []synth.Planted
	b, err := os.ReadFile(filepath.Join(dir, synth.PlantedFile))
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, &fromFile); err != nil {
		t.Fatal(err)
	}
	if diff := cmp.Diff(planted, fromFile); diff != "" {
		t.Fatalf("PLANTED.json differs from the returned list (-returned +file):\n%s", diff)
	}
	got := check(t, dir)
	if diff := cmp.Diff(planted, got); diff != "" {
		t.Errorf("findings differ from PLANTED.json (-planted +found):\n%s", diff)
	}
	kinds := map[string]bool{}
	for _, p := range planted {
		kinds[p.Check] = true
	}
	for _, c := range engine(t).Checks() {
		if !kinds[c.ID] {
			t.Errorf("no planted instance of %s: add a plant in plant.go", c.ID)
		}
	}
}

func TestSameSeedSameBytes(t *testing.T) {
	a, b := t.TempDir(), t.TempDir()
	opt := synth.Options{Animals: 150, Days: 60, Seed: 7}
	for _, d := range []string{a, b} {
		if _, err := synth.Generate(d, opt); err != nil {
			t.Fatal(err)
		}
	}
	entries, err := os.ReadDir(a)
	if err != nil {
		t.Fatal(err)
	}
	if len(entries) < 10 {
		t.Fatalf("only %d files written", len(entries))
	}
	for _, e := range entries {
		x, _ := os.ReadFile(filepath.Join(a, e.Name()))
		y, err := os.ReadFile(filepath.Join(b, e.Name()))
		if err != nil || !bytes.Equal(x, y) {
			t.Errorf("%s differs between two runs with the same seed (%v)", e.Name(), err)
		}
	}
	c := t.TempDir()
	if _, err := synth.Generate(c, synth.Options{Animals: 150, Days: 60, Seed: 8}); err != nil {
		t.Fatal(err)
	}
	x, _ := os.ReadFile(filepath.Join(a, synth.PlantedFile))
	y, _ := os.ReadFile(filepath.Join(c, synth.PlantedFile))
	if bytes.Equal(x, y) {
		t.Errorf("seeds 7 and 8 planted the same list")
	}
}

func TestRejectsSizes(t *testing.T) {
	for _, opt := range []synth.Options{{Animals: 10, Days: 60}, {Animals: 200, Days: 10}, {Animals: 200, Days: 400}} {
		if _, err := synth.Generate(t.TempDir(), opt); err == nil {
			t.Errorf("%+v: no error", opt)
		}
	}
}

func limits(t *testing.T) (*rules.Limits, []byte, map[string]any) {
	t.Helper()
	src := rules.DefaultLimits()
	lim, err := rules.LoadLimits(bytes.NewReader(src), "limits.yaml")
	if err != nil {
		t.Fatal(err)
	}
	data, err := lim.Data()
	if err != nil {
		t.Fatal(err)
	}
	return lim, src, data
}

func engine(t *testing.T) *checker.Engine {
	t.Helper()
	_, _, data := limits(t)
	e, err := checker.NewEngine(context.Background(), []checker.Source{{Name: "rules", FS: rules.FS()}}, data, checker.EngineOptions{})
	if err != nil {
		t.Fatal(err)
	}
	return e
}

func check(t *testing.T, dir string) []synth.Planted {
	t.Helper()
	lim, _, _ := limits(t)
	set, err := records.Load(os.DirFS(dir), records.Options{Species: lim.SpeciesCodes()})
	if err != nil {
		t.Fatal(err)
	}
	res, err := checker.Check(context.Background(), checker.Config{Records: set, Limits: lim, Engine: engine(t)})
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range res.NotEvaluated {
		t.Errorf("not evaluated: %s (%s)", s.Check, s.Reason)
	}
	got := []synth.Planted{}
	for _, f := range res.Findings {
		p := synth.Planted{Check: f.Check, Subject: f.Subject, On: f.On.String()}
		if !f.Until.IsZero() && f.Until != f.On {
			p.Until = f.Until.String()
		}
		got = append(got, p)
	}
	synth.SortPlanted(got)
	return got
}

// TestWeatherMargins reads the generated weather back and computes each
// day's heat index with the NWS formula (checker/heat, tested against the
// NWS heat index chart): no day's maximum air temperature or heat index lies
// within 0.5 °C of the 25 °C hot-day line or the 32 °C extreme caution line
// (NWS heat index bands), so the planted shade, water and heat-danger
// findings do not hang on rounding; and the days at or above 32 °C are
// exactly the planted heat.danger days.
func TestWeatherMargins(t *testing.T) {
	for _, opt := range []synth.Options{{Animals: 200, Days: 60, Seed: 1}, {Animals: 150, Days: 366, Seed: 2}} {
		dir := t.TempDir()
		planted, err := synth.Generate(dir, opt)
		if err != nil {
			t.Fatal(err)
		}
		f, err := os.Open(filepath.Join(dir, "weather.csv"))
		if err != nil {
			t.Fatal(err)
		}
		rows, err := csv.NewReader(f).ReadAll()
		f.Close()
		if err != nil {
			t.Fatal(err)
		}
		col := map[string]int{}
		for i, h := range rows[0] {
			col[h] = i
		}
		maxAir, maxIndex := map[string]float64{}, map[string]float64{}
		for _, r := range rows[1:] {
			air, err1 := strconv.ParseFloat(r[col["air_temp_c"]], 64)
			rh, err2 := strconv.ParseFloat(r[col["humidity_pct"]], 64)
			if err1 != nil || err2 != nil {
				t.Fatalf("%v: %v %v", r, err1, err2)
			}
			d := r[col["observed_at"]][:10]
			if _, ok := maxAir[d]; !ok || air > maxAir[d] {
				maxAir[d] = air
			}
			if hi := heat.IndexC(air, rh); hi > maxIndex[d] || maxIndex[d] == 0 {
				maxIndex[d] = hi
			}
		}
		danger := map[string]bool{}
		for _, p := range planted {
			if p.Check == "heat.danger" {
				danger[p.On] = true
			}
		}
		hot := 0
		for d, air := range maxAir {
			for _, v := range []float64{air, maxIndex[d]} {
				for _, line := range []float64{25, 32} {
					if math.Abs(v-line) < 0.5 {
						t.Errorf("%+v %s: %.2f °C is within 0.5 °C of the %v °C line", opt, d, v, line)
					}
				}
			}
			if maxIndex[d] >= 25 {
				hot++
			}
			if got := maxIndex[d] >= 32; got != danger[d] {
				t.Errorf("%+v %s: heat index %.2f °C, planted heat.danger %v", opt, d, maxIndex[d], danger[d])
			}
		}
		if hot == 0 || len(danger) == 0 {
			t.Errorf("%+v: %d hot days, %d heat-danger days: the summer is not hot enough for the heat checks", opt, hot, len(danger))
		}
	}
}
