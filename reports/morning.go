package reports

import (
	"math"
	"strconv"
)

// MorningCaution ends the view on a cold day: the figures describe exposed
// skin and records, not the animals themselves.
const MorningCaution = "Caution: cold injury: keep outdoor work to the work/warm-up schedule. " +
	"This is a records check, not a veterinary judgement: defer to the attending veterinarian, " +
	"the animal-care committee and local law."

// morningNum writes a temperature to a tenth of a degree (−12.5, −40),
// without the float noise of a converted °F reading.
func morningNum(x float64) string {
	return strconv.FormatFloat(math.Round(x*10)/10, 'f', -1, 64)
}
