package cold

import (
	"fmt"
	"math"
)

// HazardBand is one of Environment and Climate Change Canada's wind chill
// hazard bands. Wording is the published description; Label is our own
// short name for tables and messages (the published scheme also uses
// colours, which we do not).
type HazardBand struct {
	// Level orders the bands: 0 is no band (above 0), 1 the mildest, 6 the
	// most severe.
	Level int
	// Label is our short name, e.g. "freeze 10-30 min".
	Label string
	// Wording is the published description of the risk (Level 0's, for
	// wind chills above 0, is ours: the published bands start at 0).
	Wording string
	// WarmestC and ColdestC are the displayed (whole-degree) wind chills
	// the band covers, inclusive. The coldest band has ColdestC =
	// math.MinInt; the no-band entry has WarmestC = math.MaxInt.
	WarmestC, ColdestC int
}

// bands run from no band to the most severe; each covers WarmestC down to
// the next band's WarmestC + 1. Ranges and wording: Environment and Climate
// Change Canada wind chill hazard bands.
var bands = [...]HazardBand{
	{Level: 0, Label: "none", Wording: "above 0: no wind chill hazard band", WarmestC: math.MaxInt, ColdestC: 1},
	{Level: 1, Label: "low", Wording: "low", WarmestC: 0, ColdestC: -9},
	{Level: 2, Label: "hypothermia", Wording: "low (risk of hypothermia with long exposure)", WarmestC: -10, ColdestC: -27},
	{Level: 3, Label: "freeze 10-30 min", Wording: "exposed skin can freeze in 10–30 min", WarmestC: -28, ColdestC: -39},
	{Level: 4, Label: "freeze 5-10 min", Wording: "exposed skin can freeze in 5–10 min", WarmestC: -40, ColdestC: -47},
	{Level: 5, Label: "freeze 2-5 min", Wording: "exposed skin can freeze in 2–5 min", WarmestC: -48, ColdestC: -54},
	{Level: 6, Label: "freeze under 2 min", Wording: "exposed skin can freeze in under 2 min", WarmestC: -55, ColdestC: math.MinInt},
}

// Band classifies a wind chill (°C, unrounded) into its hazard band. The
// bands are published in whole degrees, so the value is first rounded as
// Display rounds it: −9.5 shows as −10 and is in the hypothermia band.
// A NaN wind chill has no band (Level 0).
func Band(windChillC float64) HazardBand {
	if math.IsNaN(windChillC) {
		return bands[0]
	}
	// Clamp before converting so an infinite input cannot overflow int.
	d := Display(math.Max(-1000, math.Min(1000, windChillC)))
	for i := len(bands) - 1; i > 0; i-- {
		if d <= bands[i].WarmestC {
			return bands[i]
		}
	}
	return bands[0]
}

// Bands returns every band, from no band (Level 0) to the most severe, for
// legends in reports.
func Bands() []HazardBand {
	out := make([]HazardBand, len(bands))
	copy(out, bands[:])
	return out
}

// Range describes the band's wind chills, e.g. "-28 to -39" or
// "-55 and colder".
func (b HazardBand) Range() string {
	switch {
	case b.WarmestC == math.MaxInt:
		return fmt.Sprintf("above %d", b.ColdestC-1)
	case b.ColdestC == math.MinInt:
		return fmt.Sprintf("%d and colder", b.WarmestC)
	}
	return fmt.Sprintf("%d to %d", b.WarmestC, b.ColdestC)
}

// String is the label and the wording, for messages.
func (b HazardBand) String() string {
	return b.Label + " (" + b.Wording + ")"
}
