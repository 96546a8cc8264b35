package cold

import "math"

// The published validity limits of the 2001 wind chill index: below these
// winds, or above these temperatures, the index is not defined and the air
// temperature stands.
const (
	// MaxAirC is the warmest air temperature, in °C, for which the index is defined.
	MaxAirC = 10.0
	// MinWindKmh is the wind, in km/h, the wind must exceed for the index to apply.
	MinWindKmh = 4.8
)

// Applies reports whether the 2001 wind chill index is defined for this air
// temperature (°C) and wind (km/h, at 10 m): T ≤ 10 °C and V > 4.8 km/h.
func Applies(airC, windKmh float64) bool {
	return airC <= MaxAirC && windKmh > MinWindKmh
}

// WindChillC is the 2001 North American wind chill index for an air
// temperature in °C and a wind in km/h measured at 10 m:
//
//	13.12 + 0.6215·T − 11.37·V^0.16 + 0.3965·T·V^0.16
//
// Where the index is not defined (see Applies) it returns the air
// temperature, as the published charts do. The result is not rounded; use
// Display for the charted whole degree.
func WindChillC(airC, windKmh float64) float64 {
	if !Applies(airC, windKmh) {
		return airC
	}
	v := math.Pow(windKmh, 0.16)
	return 13.12 + 0.6215*airC - 11.37*v + 0.3965*airC*v
}

// Display rounds a temperature or wind chill to the nearest whole degree,
// halves away from zero (math.Round), as the published charts show it.
// Comparisons against limits should use the unrounded value unless a rule
// says otherwise; Band uses the displayed value because the hazard bands are
// published in whole degrees. x must be finite.
func Display(x float64) int {
	return int(math.Round(x))
}
