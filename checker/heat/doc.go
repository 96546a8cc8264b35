// Package heat holds the warm-season computation the heat checks use: the
// US National Weather Service heat index and its hazard bands. It is pure
// computation: no I/O, no globals that change.
//
// What is published, and by whom (NWS Weather Prediction Center, "The Heat
// Index Equation"):
//
//   - Steadman's simple form 0.5·(T + 61 + (T−68)·1.2 + RH·0.094), in °F and
//     % relative humidity. Averaged with T it selects the formula: when the
//     average is below 80 °F the simple value itself is the heat index.
//   - Otherwise the Rothfusz (1990, NWS SR 90-23) regression, with the two
//     NWS adjustments: minus ((13−RH)/4)·sqrt((17−|T−95|)/17) when RH < 13 %
//     and 80 ≤ T ≤ 112 °F; plus ((RH−85)/10)·((87−T)/5) when RH > 85 % and
//     80 ≤ T ≤ 87 °F.
//   - The hazard bands: 80–90 °F (27–32 °C) caution, 90–103 °F (32–39 °C)
//     extreme caution, 103–124 °F (39–51 °C) danger, 125 °F (52 °C) and
//     above extreme danger.
//
// The index is computed in °F, as published, and converted to °C
// (NIST SP 811: °C = (°F − 32)/1.8); bands are classified on the °C value,
// as the checks compare their limits in °C. What is ours: the short band
// labels and the names of the types. The index describes how hot it feels
// to a person in the shade; for animals it is a guide only, and does not
// replace the judgement of the attending veterinarian, the animal-care
// committee or local law.
package heat
