package cold

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
	"github.com/google/go-cmp/cmp/cmpopts"
)

// nwsChart are cells of the US National Weather Service Wind Chill Chart
// (2001 index): air °F, wind mph, the charted whole-degree value.
var nwsChart = []struct {
	name      string
	airF, mph float64
	want      int
}{
	{"40F 5mph", 40, 5, 36},      // NWS Wind Chill Chart: 40 °F, 5 mph → 36
	{"40F 60mph", 40, 60, 25},    // NWS Wind Chill Chart: 40 °F, 60 mph → 25
	{"30F 10mph", 30, 10, 21},    // NWS Wind Chill Chart: 30 °F, 10 mph → 21
	{"20F 20mph", 20, 20, 4},     // NWS Wind Chill Chart: 20 °F, 20 mph → 4
	{"15F 15mph", 15, 15, 0},     // NWS Wind Chill Chart: 15 °F, 15 mph → 0
	{"10F 15mph", 10, 15, -7},    // NWS Wind Chill Chart: 10 °F, 15 mph → −7
	{"5F 30mph", 5, 30, -19},     // NWS Wind Chill Chart: 5 °F, 30 mph → −19
	{"0F 15mph", 0, 15, -19},     // NWS Wind Chill Chart: 0 °F, 15 mph → −19 (the chart's own worked example)
	{"0F 20mph", 0, 20, -22},     // NWS Wind Chill Chart: 0 °F, 20 mph → −22
	{"-5F 25mph", -5, 25, -31},   // NWS Wind Chill Chart: −5 °F, 25 mph → −31
	{"-10F 20mph", -10, 20, -35}, // NWS Wind Chill Chart: −10 °F, 20 mph → −35
	{"-15F 40mph", -15, 40, -50}, // NWS Wind Chill Chart: −15 °F, 40 mph → −50
	{"-20F 20mph", -20, 20, -48}, // NWS Wind Chill Chart: −20 °F, 20 mph → −48
	{"-25F 30mph", -25, 30, -60}, // NWS Wind Chill Chart: −25 °F, 30 mph → −60
	{"-35F 35mph", -35, 35, -76}, // NWS Wind Chill Chart: −35 °F, 35 mph → −76
	{"-45F 60mph", -45, 60, -98}, // NWS Wind Chill Chart: −45 °F, 60 mph → −98
}

func TestWindChillFNWSChart(t *testing.T) {
	for _, tc := range nwsChart {
		t.Run(tc.name, func(t *testing.T) {
			got := Display(windChillF(tc.airF, tc.mph))
			if got != tc.want {
				t.Errorf("Display(windChillF(%g, %g)) = %d, want %d", tc.airF, tc.mph, got, tc.want)
			}
		})
	}
}

// The metric form, fed the chart's conditions converted to °C and km/h and
// converted back to °F, must land on the same charted degree: this ties the
// °C/km/h coefficients and the unit helpers to the NWS chart.
func TestWindChillCMatchesNWSChart(t *testing.T) {
	for _, tc := range nwsChart {
		t.Run(tc.name, func(t *testing.T) {
			got := Display(cToF(WindChillC(fToC(tc.airF), mphToKmh(tc.mph))))
			if got != tc.want {
				t.Errorf("via °C/km/h: %g °F, %g mph → %d, want %d", tc.airF, tc.mph, got, tc.want)
			}
		})
	}
}

// The °F/mph form (NWS) and the °C/km/h form (Environment Canada) are the
// same 2001 index with separately rounded coefficients, so over the NWS
// chart's whole grid (−45…40 °F, 5…60 mph) they agree closely. We measured
// the largest gap as 0.095 °F; 0.1 °F catches a slip in either form that
// the rounded chart cells would hide.
func TestWindChillFormsAgree(t *testing.T) {
	for f := -45.0; f <= 40; f += 5 {
		for v := 5.0; v <= 60; v += 5 {
			viaC := cToF(WindChillC(fToC(f), mphToKmh(v)))
			if d := math.Abs(windChillF(f, v) - viaC); d > 0.1 {
				t.Errorf("%g °F, %g mph: °F form %.3f, °C form %.3f (gap %.3f)", f, v, windChillF(f, v), viaC, d)
			}
		}
	}
}

func TestWindChillCEnvironmentCanadaTable(t *testing.T) {
	tests := []struct {
		name      string
		airC, kmh float64
		want      int
	}{
		{"5C 5kmh", 5, 5, 4},         // Environment Canada wind chill table: 5 °C, 5 km/h → 4
		{"0C 10kmh", 0, 10, -3},      // Environment Canada wind chill table: 0 °C, 10 km/h → −3
		{"-5C 5kmh", -5, 5, -7},      // Environment Canada wind chill table: −5 °C, 5 km/h → −7
		{"-10C 20kmh", -10, 20, -18}, // Environment Canada wind chill table: −10 °C, 20 km/h → −18
		{"-15C 30kmh", -15, 30, -26}, // Environment Canada wind chill table: −15 °C, 30 km/h → −26
		{"-20C 50kmh", -20, 50, -35}, // Environment Canada wind chill table: −20 °C, 50 km/h → −35
		{"-25C 20kmh", -25, 20, -37}, // Environment Canada wind chill table: −25 °C, 20 km/h → −37 (its own worked example)
		{"-30C 40kmh", -30, 40, -48}, // Environment Canada wind chill table: −30 °C, 40 km/h → −48
		{"-35C 15kmh", -35, 15, -48}, // Environment Canada wind chill table: −35 °C, 15 km/h → −48
		{"-40C 10kmh", -40, 10, -51}, // Environment Canada wind chill table: −40 °C, 10 km/h → −51
		{"-45C 70kmh", -45, 70, -72}, // Environment Canada wind chill table: −45 °C, 70 km/h → −72
		{"-50C 80kmh", -50, 80, -81}, // Environment Canada wind chill table: −50 °C, 80 km/h → −81
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := Display(WindChillC(tc.airC, tc.kmh))
			if got != tc.want {
				t.Errorf("Display(WindChillC(%g, %g)) = %d, want %d", tc.airC, tc.kmh, got, tc.want)
			}
		})
	}
}

// Raw values that sit near a half degree: a formula or rounding slip shows
// here first. The raw figures are the formula's, as given beside the
// Environment Canada table values they round to.
func TestWindChillCNearHalf(t *testing.T) {
	tests := []struct {
		name      string
		airC, kmh float64
		wantRaw   float64
		wantShown int
	}{
		{"-30C 40kmh", -30, 40, -47.504, -48}, // Environment Canada table −30 °C, 40 km/h → −48; raw −47.504
		{"-45C 70kmh", -45, 70, -72.496, -72}, // Environment Canada table −45 °C, 70 km/h → −72; raw −72.496
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			raw := WindChillC(tc.airC, tc.kmh)
			if math.Abs(raw-tc.wantRaw) > 0.0006 {
				t.Errorf("WindChillC(%g, %g) = %.5f, want %.3f ± 0.0005", tc.airC, tc.kmh, raw, tc.wantRaw)
			}
			if got := Display(raw); got != tc.wantShown {
				t.Errorf("Display(%.5f) = %d, want %d", raw, got, tc.wantShown)
			}
		})
	}
}

// The published validity limits: T ≤ 10 °C and V > 4.8 km/h (2001 index);
// outside them the air temperature stands.
func TestWindChillCValidity(t *testing.T) {
	formula := func(tc, v float64) float64 {
		p := math.Pow(v, 0.16)
		return 13.12 + 0.6215*tc - 11.37*p + 0.3965*tc*p
	}
	tests := []struct {
		name        string
		airC, kmh   float64
		want        float64
		wantApplies bool
	}{
		{"wind exactly 4.8", -20, 4.8, -20, false}, // 2001 index: defined only for V > 4.8 km/h
		{"wind 4.81", -20, 4.81, formula(-20, 4.81), true},
		{"calm", -20, 0, -20, false},
		{"air exactly 10", 10, 20, formula(10, 20), true}, // 2001 index: defined for T ≤ 10 °C
		{"air 10.01", 10.01, 20, 10.01, false},
		{"warm and calm", 25, 0, 25, false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := WindChillC(tc.airC, tc.kmh)
			if diff := cmp.Diff(tc.want, got, cmpopts.EquateApprox(0, 1e-9)); diff != "" {
				t.Errorf("WindChillC(%g, %g) (-want +got):\n%s", tc.airC, tc.kmh, diff)
			}
			if got := Applies(tc.airC, tc.kmh); got != tc.wantApplies {
				t.Errorf("Applies(%g, %g) = %v, want %v", tc.airC, tc.kmh, got, tc.wantApplies)
			}
			// Applying the formula must actually change the figure, else
			// the "formula" cases above would pass on a function that
			// always returns the air temperature.
			if tc.wantApplies && got == tc.airC {
				t.Errorf("WindChillC(%g, %g) returned the air temperature", tc.airC, tc.kmh)
			}
		})
	}
}

// The °F/mph form has the same limits stated in its own units: T ≤ 50 °F,
// V > 3 mph (2001 index as published by the NWS).
func TestWindChillFValidity(t *testing.T) {
	tests := []struct {
		name      string
		airF, mph float64
		same      bool
	}{
		{"wind exactly 3", 0, 3, true},
		{"wind 3.01", 0, 3.01, false},
		{"air exactly 50", 50, 10, false},
		{"air 50.01", 50.01, 10, true},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			got := windChillF(tc.airF, tc.mph)
			if (got == tc.airF) != tc.same {
				t.Errorf("windChillF(%g, %g) = %g; air temperature returned: %v, want %v", tc.airF, tc.mph, got, got == tc.airF, tc.same)
			}
		})
	}
}

func TestUnits(t *testing.T) {
	tests := []struct {
		name string
		got  float64
		want float64
	}{
		{"-40C is -40F", cToF(-40), -40},   // common practice: the scales cross at −40
		{"-40F is -40C", fToC(-40), -40},   // common practice: the scales cross at −40
		{"freezing", fToC(32), 0},          // NIST SP 811: water freezes at 32 °F = 0 °C
		{"boiling", cToF(100), 212},        // NIST SP 811: 100 °C = 212 °F
		{"1 mph", mphToKmh(1), 1.609344},   // NIST SP 811: 1 mph = 1.609344 km/h exactly
		{"60 mph", mphToKmh(60), 96.56064}, // NIST SP 811 factor × 60
		{"1.609344 km/h", kmhToMph(1.609344), 1},
		{"round trip wind", kmhToMph(mphToKmh(37)), 37},
		{"round trip temp", fToC(cToF(-37.5)), -37.5},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if diff := cmp.Diff(tc.want, tc.got, cmpopts.EquateApprox(0, 1e-9)); diff != "" {
				t.Errorf("(-want +got):\n%s", diff)
			}
		})
	}
}

// Display rounds halves away from zero, like the published charts (and
// math.Round), not to even.
func TestDisplay(t *testing.T) {
	tests := []struct {
		in   float64
		want int
	}{
		{-47.5, -48}, {-47.49, -47}, {-72.5, -73}, {2.5, 3}, {0.5, 1}, {-0.5, -1}, {-0.4, 0}, {1.5, 2},
	}
	for _, tc := range tests {
		t.Run("", func(t *testing.T) {
			if got := Display(tc.in); got != tc.want {
				t.Errorf("Display(%g) = %d, want %d", tc.in, got, tc.want)
			}
		})
	}
}

func BenchmarkWindChillC(b *testing.B) {
	var sink float64
	for i := 0; b.Loop(); i++ {
		sink += WindChillC(-30+float64(i&15), 5+float64(i&31))
	}
	_ = sink
}

// The °F/mph form and the unit conversions are used here only, to hold
// WindChillC to the NWS chart, which is published in °F and mph.

// windChillF is the same index in its °F/mph form:
//
//	35.74 + 0.6215·T − 35.75·V^0.16 + 0.4275·T·V^0.16
//
// defined for T ≤ 50 °F and V > 3 mph; otherwise it returns the air
// temperature. The two forms agree to within rounding, not exactly, because
// their coefficients were rounded separately.
func windChillF(airF, windMph float64) float64 {
	if airF > 50.0 || windMph <= 3.0 {
		return airF
	}
	v := math.Pow(windMph, 0.16)
	return 35.74 + 0.6215*airF - 35.75*v + 0.4275*airF*v
}

// mphKmh is the exact factor of NIST SP 811: 1 mph = 1.609344 km/h.
const mphKmh = 1.609344

// fToC converts °F to °C: (°F − 32)/1.8 (NIST SP 811).
func fToC(f float64) float64 { return (f - 32) / 1.8 }

// cToF converts °C to °F: °C·1.8 + 32 (NIST SP 811).
func cToF(c float64) float64 { return c*1.8 + 32 }

// mphToKmh converts miles per hour to km/h (1 mph = 1.609344 km/h exactly, NIST SP 811).
func mphToKmh(mph float64) float64 { return mph * mphKmh }

// kmhToMph converts km/h to miles per hour (NIST SP 811).
func kmhToMph(kmh float64) float64 { return kmh / mphKmh }
