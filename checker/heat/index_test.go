package heat

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// nwsChart are cells of the NWS heat index chart (air °F, relative humidity
// %, the charted heat index °F), as shared/references.md lists them. They are
// marked there [M]: recalled, each agreeing with the NWS formula within
// 1 °F; verify against the published chart before relying on them.
var nwsChart = []struct {
	airF, rh float64
	want     float64
}{
	{80, 40, 80},   // NWS heat index chart [M]: 80 °F, 40 % → 80
	{90, 40, 91},   // NWS heat index chart [M]: 90 °F, 40 % → 91
	{100, 40, 109}, // NWS heat index chart [M]: 100 °F, 40 % → 109
	{110, 40, 136}, // NWS heat index chart [M]: 110 °F, 40 % → 136
	{90, 50, 95},   // NWS heat index chart [M]: 90 °F, 50 % → 95
	{96, 50, 108},  // NWS heat index chart [M]: 96 °F, 50 % → 108
	{100, 50, 118}, // NWS heat index chart [M]: 100 °F, 50 % → 118
	{86, 60, 91},   // NWS heat index chart [M]: 86 °F, 60 % → 91
	{94, 60, 110},  // NWS heat index chart [M]: 94 °F, 60 % → 110
	{88, 70, 100},  // NWS heat index chart [M]: 88 °F, 70 % → 100
	{96, 70, 126},  // NWS heat index chart [M]: 96 °F, 70 % → 126
	{84, 80, 94},   // NWS heat index chart [M]: 84 °F, 80 % → 94
	{90, 80, 113},  // NWS heat index chart [M]: 90 °F, 80 % → 113
	{86, 90, 105},  // NWS heat index chart [M]: 86 °F, 90 % → 105
	{92, 90, 131},  // NWS heat index chart [M]: 92 °F, 90 % → 131
	{86, 100, 112}, // NWS heat index chart [M]: 86 °F, 100 % → 112
	{90, 100, 132}, // NWS heat index chart [M]: 90 °F, 100 % → 132
}

func TestIndexFNWSChart(t *testing.T) {
	for _, tc := range nwsChart {
		got := IndexF(tc.airF, tc.rh)
		if math.Abs(got-tc.want) > 1 {
			t.Errorf("IndexF(%g °F, %g %%) = %.2f, want %g ± 1 (NWS chart)", tc.airF, tc.rh, got, tc.want)
		}
	}
}

// The same cells through the °C form: converted in, converted back out, the
// chart value must still hold within 1 °F. This ties IndexC and the unit
// conversions to the chart.
func TestIndexCNWSChart(t *testing.T) {
	for _, tc := range nwsChart {
		got := CToF(IndexC(FToC(tc.airF), tc.rh))
		if math.Abs(got-tc.want) > 1 {
			t.Errorf("via °C: %g °F, %g %% → %.2f °F, want %g ± 1 (NWS chart)", tc.airF, tc.rh, got, tc.want)
		}
	}
}

// The chart's (80 °F, 100 %) → 87 predates the NWS high-humidity
// adjustment (shared/references.md): the formula as published gives about
// 89. The cell is a documented difference, not an equality: the index must
// differ from the chart by more than 1 °F, and the difference must be
// exactly the high-humidity adjustment ((100−85)/10)·((87−80)/5) = 2.1 °F,
// so that the unadjusted regression lands on the charted 87.
func TestIndexFChartDifference80F100Pct(t *testing.T) {
	const chart = 87 // NWS heat index chart [M]: 80 °F, 100 % → 87 (before the adjustment)
	got := IndexF(80, 100)
	if math.Abs(got-chart) <= 1 {
		t.Errorf("IndexF(80, 100) = %.2f agrees with the pre-adjustment chart value %d; the adjustment is missing", got, chart)
	}
	const adjustment = 1.5 * 1.4 // ((RH−85)/10)·((87−T)/5) at 80 °F, 100 % (NWS WPC, The Heat Index Equation)
	if unadjusted := got - adjustment; math.Round(unadjusted) != chart {
		t.Errorf("IndexF(80, 100) − %.1f = %.2f, want it to round to the chart's %d", adjustment, unadjusted, chart)
	}
}

// Worked values: the NWS WPC formula ("The Heat Index Equation") worked by
// hand for each branch, to 0.001 °F.
func TestIndexFWorked(t *testing.T) {
	tests := []struct {
		name      string
		airF, rh  float64
		want      float64
		regressed bool
	}{
		// Simple form: 0.5·(70 + 61 + 2·1.2 + 50·0.094) = 0.5·138.1 = 69.05;
		// averaged with 70 it is 69.525 < 80, so 69.05 is the index.
		{"simple 70F 50%", 70, 50, 69.05, false},
		// 0.5·(79 + 61 + 11·1.2 + 60·0.094) = 0.5·158.84 = 79.42; average 79.21 < 80.
		{"simple 79F 60%", 79, 60, 79.42, false},
		// T = 81 °F is above 80, but the simple value 0.5·(81 + 61 + 15.6 + 0)
		// = 78.8 averaged with 81 is 79.9 < 80: the simple value stands (the
		// regression would give 78.728).
		{"simple selects 81F 0%", 81, 0, 78.8, false},
		// Regression without adjustment: 90 °F, 40 % → 90.680 (coefficients of
		// Rothfusz 1990 as NWS gives them).
		{"regression 90F 40%", 90, 40, 90.6797, true},
		// Low-humidity adjustment: regression 94.1843 minus
		// ((13−5)/4)·sqrt((17−|100−95|)/17) = 2·sqrt(12/17) = 1.6803 → 92.5040.
		{"low humidity 100F 5%", 100, 5, 94.1843 - 1.6803, true},
		// At 112 °F the adjustment's square root is sqrt(0/17) = 0: regression only.
		{"low humidity edge 112F 10%", 112, 10, 106.7510, true},
		// Above 112 °F no low-humidity adjustment applies.
		{"no low humidity adjustment 113F 10%", 113, 10, 107.8191, true},
		// High-humidity adjustment: regression 101.5808 plus
		// ((90−85)/10)·((87−85)/5) = 0.5·0.4 = 0.2 → 101.7808.
		{"high humidity 85F 90%", 85, 90, 101.5808 + 0.2, true},
		// At 87 °F the adjustment is ((90−85)/10)·0 = 0.
		{"high humidity edge 87F 90%", 87, 90, 109.1832, true},
		// Above 87 °F no high-humidity adjustment applies.
		{"no high humidity adjustment 88F 90%", 88, 90, 113.2473, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if got := IndexF(tc.airF, tc.rh); math.Abs(got-tc.want) > 0.001 {
				t.Errorf("IndexF(%g, %g) = %.4f, want %.4f", tc.airF, tc.rh, got, tc.want)
			}
			if got := UsesRegression(tc.airF, tc.rh); got != tc.regressed {
				t.Errorf("UsesRegression(%g, %g) = %v, want %v", tc.airF, tc.rh, got, tc.regressed)
			}
		})
	}
}

func TestBandC(t *testing.T) {
	// Lower bounds: NWS heat index bands, 27/32/39/52 °C (80/90/103/125 °F).
	tests := []struct {
		c    float64
		want string
	}{
		{math.NaN(), "none"},
		{20, "none"},
		{26.99, "none"},
		{27, "caution"}, // NWS: caution from 27 °C (80 °F)
		{31.99, "caution"},
		{32, "extreme_caution"}, // NWS: extreme caution from 32 °C (90 °F)
		{38.99, "extreme_caution"},
		{39, "danger"}, // NWS: danger from 39 °C (103 °F)
		{51.9, "danger"},
		{52, "extreme_danger"}, // NWS: extreme danger from 52 °C (125 °F)
		{70, "extreme_danger"},
	}
	var got, want []string
	for _, tc := range tests {
		got = append(got, BandC(tc.c).Label)
		want = append(want, tc.want)
	}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("BandC labels (-want +got):\n%s", diff)
	}
}

// The band table's °C and °F bounds are the same NWS bands: each °F bound
// converted to °C rounds to the °C bound NWS prints beside it.
func TestBandsAgreeInBothUnits(t *testing.T) {
	for _, b := range Bands()[1:] {
		if got := math.Round(FToC(b.FromF)); got != b.FromC {
			t.Errorf("band %s: %g °F is %.1f °C, rounds to %g, want %g", b.Label, b.FromF, FToC(b.FromF), got, b.FromC)
		}
	}
}
