package heat

import "math"

// SimpleF is Steadman's simple form of the heat index, in °F, for an air
// temperature in °F and a relative humidity in %:
//
//	0.5·(T + 61 + (T−68)·1.2 + RH·0.094)
func SimpleF(airF, rhPct float64) float64 {
	return 0.5 * (airF + 61 + (airF-68)*1.2 + rhPct*0.094)
}

// RegressionF is the Rothfusz (1990) regression with the NWS adjustments
// for low humidity (RH < 13 %, 80 ≤ T ≤ 112 °F) and high humidity
// (RH > 85 %, 80 ≤ T ≤ 87 °F), in °F. It is what IndexF uses once the
// simple form averaged with T reaches 80 °F.
func RegressionF(airF, rhPct float64) float64 {
	t, r := airF, rhPct
	hi := -42.379 + 2.04901523*t + 10.14333127*r - 0.22475541*t*r -
		0.00683783*t*t - 0.05481717*r*r + 0.00122874*t*t*r +
		0.00085282*t*r*r - 0.00000199*t*t*r*r
	if r < 13 && t >= 80 && t <= 112 {
		hi -= ((13 - r) / 4) * math.Sqrt((17-math.Abs(t-95))/17)
	}
	if r > 85 && t >= 80 && t <= 87 {
		hi += ((r - 85) / 10) * ((87 - t) / 5)
	}
	return hi
}

// UsesRegression reports whether the NWS procedure takes the regression for
// these conditions: the simple form averaged with T is 80 °F or more.
func UsesRegression(airF, rhPct float64) bool {
	return (SimpleF(airF, rhPct)+airF)/2 >= 80
}

// IndexF is the NWS heat index in °F for an air temperature in °F and a
// relative humidity in % (0…100): Steadman's simple value when the simple
// value averaged with T is below 80 °F, otherwise the adjusted regression.
// The result is not rounded.
func IndexF(airF, rhPct float64) float64 {
	if !UsesRegression(airF, rhPct) {
		return SimpleF(airF, rhPct)
	}
	return RegressionF(airF, rhPct)
}

// IndexC is IndexF for an air temperature in °C, with the result in °C.
func IndexC(airC, rhPct float64) float64 {
	return FToC(IndexF(CToF(airC), rhPct))
}

// FToC converts °F to °C: (°F − 32)/1.8 (NIST SP 811).
func FToC(f float64) float64 { return (f - 32) / 1.8 }

// CToF converts °C to °F: °C·1.8 + 32 (NIST SP 811).
func CToF(c float64) float64 { return c*1.8 + 32 }
