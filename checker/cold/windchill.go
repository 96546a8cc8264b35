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
	// MaxAirF is MaxAirC in °F.
	MaxAirF = 50.0
	// MinWindMph is MinWindKmh in mph, as the °F/mph form states it.
	MinWindMph = 3.0
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

// WindChillF is the same index in its °F/mph form:
//
//	35.74 + 0.6215·T − 35.75·V^0.16 + 0.4275·T·V^0.16
//
// defined for T ≤ 50 °F and V > 3 mph; otherwise it returns the air
// temperature. The two forms agree to within rounding, not exactly, because
// their coefficients were rounded separately.
func WindChillF(airF, windMph float64) float64 {
	if airF > MaxAirF || windMph <= MinWindMph {
		return airF
	}
	v := math.Pow(windMph, 0.16)
	return 35.74 + 0.6215*airF - 35.75*v + 0.4275*airF*v
}

// Display rounds a temperature or wind chill to the nearest whole degree,
// halves away from zero (math.Round), as the published charts show it.
// Comparisons against limits should use the unrounded value unless a rule
// says otherwise; Band uses the displayed value because the hazard bands are
// published in whole degrees. x must be finite.
func Display(x float64) int {
	return int(math.Round(x))
}

// mphKmh is the exact factor of NIST SP 811: 1 mph = 1.609344 km/h.
const mphKmh = 1.609344

// FToC converts °F to °C: (°F − 32)/1.8 (NIST SP 811).
func FToC(f float64) float64 { return (f - 32) / 1.8 }

// CToF converts °C to °F: °C·1.8 + 32 (NIST SP 811).
func CToF(c float64) float64 { return c*1.8 + 32 }

// MphToKmh converts miles per hour to km/h (1 mph = 1.609344 km/h exactly, NIST SP 811).
func MphToKmh(mph float64) float64 { return mph * mphKmh }

// KmhToMph converts km/h to miles per hour (NIST SP 811).
func KmhToMph(kmh float64) float64 { return kmh / mphKmh }
