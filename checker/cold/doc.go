// Package cold holds the cold-stress computations the cold checks use: the
// wind chill index, the wind chill hazard bands and the work/warm-up
// schedule lookup. It is pure computation: no I/O, no globals that change.
//
// What is published, and by whom:
//
//   - The wind chill formula is the 2001 North American wind chill
//     temperature index (used by Environment and Climate Change Canada and
//     the US National Weather Service), in its °C/km/h form, with its
//     published validity limits (T ≤ 10 °C, V > 4.8 km/h). Published charts
//     show the value rounded to the nearest degree; Display does that
//     rounding. The records arrive in SI units (records converts °F and mph
//     on loading); the tests hold the °C form to the NWS chart in °F/mph.
//   - The hazard bands and their wording are Environment and Climate Change
//     Canada's wind chill hazard bands.
//   - The work/warm-up schedule is the ACGIH TLV cold-stress schedule for a
//     4-hour shift (of Saskatchewan origin). The table itself is not in this
//     package: it is data in limits.yaml (cold.work_warmup), so a facility
//     can edit it; NewSchedule reads it.
//
// What is ours: the short band labels, the reading of the schedule as a
// lookup (row = air temperature rounded down to a whole degree; the first
// wind column at or above the wind; light work one row colder; an empty
// activity is moderate), and the names of the types. The cautions that go
// with these figures (they describe exposed skin, not fur, and do not
// replace the judgement of the attending veterinarian, the animal-care
// committee, occupational health or local law) belong in the reports.
package cold
