package synth_test

import (
	"encoding/csv"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"testing"

	"welfare/checker/heat"
	"welfare/records/synth"
)

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
