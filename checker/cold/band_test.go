package cold

import (
	"math"
	"testing"

	"github.com/google/go-cmp/cmp"
)

// Band edges: Environment and Climate Change Canada wind chill hazard bands,
// 0 to −9 low; −10 to −27 low with risk of hypothermia on long exposure;
// −28 to −39 skin can freeze in 10–30 min; −40 to −47 in 5–10 min; −48 to
// −54 in 2–5 min; −55 and colder in under 2 min.
func TestBandEdges(t *testing.T) {
	tests := []struct {
		name      string
		wc        float64
		wantLevel int
		wantWord  string
	}{
		{"1 no band", 1, 0, "above 0: no wind chill hazard band"}, // ECCC bands start at 0
		{"0.5 shows as 1", 0.5, 0, "above 0: no wind chill hazard band"},
		{"0 low", 0, 1, "low"},               // ECCC: 0 to −9 low
		{"-0.4 shows as 0", -0.4, 1, "low"},  // rounded for display first
		{"-9 low", -9, 1, "low"},             // ECCC: 0 to −9 low
		{"-9.4 shows as -9", -9.4, 1, "low"}, // rounded for display first
		{"-9.5 shows as -10", -9.5, 2, "low (risk of hypothermia with long exposure)"},
		{"-10", -10, 2, "low (risk of hypothermia with long exposure)"}, // ECCC: −10 to −27
		{"-27", -27, 2, "low (risk of hypothermia with long exposure)"}, // ECCC: −10 to −27
		{"-28", -28, 3, "exposed skin can freeze in 10–30 min"},         // ECCC: −28 to −39
		{"-39", -39, 3, "exposed skin can freeze in 10–30 min"},         // ECCC: −28 to −39
		{"-40", -40, 4, "exposed skin can freeze in 5–10 min"},          // ECCC: −40 to −47
		{"-47", -47, 4, "exposed skin can freeze in 5–10 min"},          // ECCC: −40 to −47
		{"-47.504 shows as -48", -47.504, 5, "exposed skin can freeze in 2–5 min"},
		{"-48", -48, 5, "exposed skin can freeze in 2–5 min"},     // ECCC: −48 to −54
		{"-54", -54, 5, "exposed skin can freeze in 2–5 min"},     // ECCC: −48 to −54
		{"-55", -55, 6, "exposed skin can freeze in under 2 min"}, // ECCC: −55 and colder
		{"-90", -90, 6, "exposed skin can freeze in under 2 min"}, // ECCC: −55 and colder
		{"-Inf", math.Inf(-1), 6, "exposed skin can freeze in under 2 min"},
		{"NaN", math.NaN(), 0, "above 0: no wind chill hazard band"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			b := Band(tc.wc)
			type lw struct {
				Level   int
				Wording string
			}
			if diff := cmp.Diff(lw{tc.wantLevel, tc.wantWord}, lw{b.Level, b.Wording}); diff != "" {
				t.Errorf("Band(%g) (-want +got):\n%s", tc.wc, diff)
			}
		})
	}
}

// Every band's stated range must classify back to the band, and the ranges
// must tile the integers with no gap or overlap.
func TestBandsTile(t *testing.T) {
	bs := Bands()
	for i, b := range bs {
		if b.Level != i {
			t.Errorf("Bands()[%d].Level = %d", i, b.Level)
		}
		if i > 0 && bs[i-1].ColdestC != b.WarmestC+1 {
			t.Errorf("gap or overlap between %q (coldest %d) and %q (warmest %d)", bs[i-1].Label, bs[i-1].ColdestC, b.Label, b.WarmestC)
		}
		for _, edge := range []int{b.WarmestC, b.ColdestC} {
			if edge == math.MaxInt || edge == math.MinInt {
				continue
			}
			if got := Band(float64(edge)); got.Level != b.Level {
				t.Errorf("Band(%d).Level = %d, want %d (%s)", edge, got.Level, b.Level, b.Range())
			}
		}
	}
	got := []string{}
	for _, b := range bs {
		got = append(got, b.Range())
	}
	want := []string{"above 0", "0 to -9", "-10 to -27", "-28 to -39", "-40 to -47", "-48 to -54", "-55 and colder"}
	if diff := cmp.Diff(want, got); diff != "" {
		t.Errorf("ranges (-want +got):\n%s", diff)
	}
	// Bands returns a copy: changing it must not change Band.
	bs[3].Wording = "changed"
	if Band(-30).Wording == "changed" {
		t.Error("Bands() exposes the package's table")
	}
}

// The frostbite note of the catalogue fires at −28 and colder, the first
// "exposed skin can freeze" band (ECCC); the worked Environment Canada value
// −25 °C, 20 km/h → −37 lies in it.
func TestBandOfPublishedWindChill(t *testing.T) {
	b := Band(WindChillC(-25, 20)) // Environment Canada table: −25 °C, 20 km/h → −37
	if b.Level != 3 {
		t.Errorf("Band(WindChillC(-25, 20)) = %v, want level 3 (skin can freeze in 10–30 min)", b)
	}
}
