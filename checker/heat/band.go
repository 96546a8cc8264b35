package heat

import "math"

// Band is one of the NWS heat index hazard bands. Label is our short name;
// Wording is the published band name.
type Band struct {
	// Level orders the bands: 0 is no band (below caution), 4 the most
	// severe.
	Level int
	// Label is our short name for tables and facts, e.g. "extreme_caution".
	Label string
	// Wording is the published band name, e.g. "extreme caution".
	Wording string
	// FromC and FromF are the band's lowest heat index, inclusive, as the
	// NWS publishes it in °C and °F. The no-band entry has -Inf.
	FromC, FromF float64
}

// bands from no band to the most severe. Lower bounds: NWS heat index
// chart bands, 80/90/103/125 °F, and the °C figures NWS gives beside them
// (27/32/39/52 °C).
var bands = [...]Band{
	{Level: 0, Label: "none", Wording: "below the caution band", FromC: math.Inf(-1), FromF: math.Inf(-1)},
	{Level: 1, Label: "caution", Wording: "caution", FromC: 27, FromF: 80},
	{Level: 2, Label: "extreme_caution", Wording: "extreme caution", FromC: 32, FromF: 90},
	{Level: 3, Label: "danger", Wording: "danger", FromC: 39, FromF: 103},
	{Level: 4, Label: "extreme_danger", Wording: "extreme danger", FromC: 52, FromF: 125},
}

// BandC classifies a heat index in °C (unrounded). Thresholds are compared
// on the °C value. A NaN has no band.
func BandC(indexC float64) Band {
	for i := len(bands) - 1; i > 0; i-- {
		if indexC >= bands[i].FromC {
			return bands[i]
		}
	}
	return bands[0]
}

// Bands returns every band, from no band to the most severe, for legends.
func Bands() []Band {
	out := make([]Band, len(bands))
	copy(out, bands[:])
	return out
}
