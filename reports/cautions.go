package reports

import (
	"fmt"
	"strings"

	"welfare/checker"
	"welfare/checker/heat"
)

// BiteReportKey is the limit both handling.bite.not_reported and the bite
// caution use, so the rule and the caution cannot disagree.
const BiteReportKey = "handling.report_within_hours"

// BiteReportCaution is the handling caution on reporting bites and
// scratches, quoting the bite-report limit in force (r.Limits); with no such
// line it says the limit was not given rather than inventing one.
func BiteReportCaution(r *checker.Result) string {
	within := "within the time the facility's limits set (not given to this report)"
	for _, l := range r.Limits {
		if l.Key == BiteReportKey {
			within = "within " + l.Value + " h (the limits in force, the same limit the bite-report check uses)"
			break
		}
	}
	return "Report every bite or scratch, however small, to the supervisor and occupational health " + within +
		", with the animal's id, so a physician can decide on rabies post-exposure prophylaxis."
}

// RabiesExposureCaution cites the post-exposure recommendations, not the
// 2022 pre-exposure report.
const RabiesExposureCaution = "Rabies: foxes are a reservoir species. Any bite, scratch, or saliva on broken skin or a " +
	"mucous membrane needs a prompt rabies post-exposure assessment by a physician or public health, whatever the " +
	"person's vaccination status (ACIP post-exposure recommendations, MMWR 2008;57(RR-3), updated 2010, MMWR " +
	"2010;59(RR-2) [from memory: verify])."

// HeatBandsCaution is the staff caution on planning hot-day work by the heat
// index, quoting the NWS bands from checker/heat (the one place they are
// written down), so the caution and the charts cannot disagree.
func HeatBandsCaution() string {
	var parts []string
	for _, b := range heat.Bands() {
		if b.Level == 0 {
			continue
		}
		parts = append(parts, fmt.Sprintf("%s from %g °C (%g °F)", b.Wording, b.FromC, b.FromF))
	}
	return "Plan hot-day work by the heat index (US National Weather Service heat index bands: " + strings.Join(parts, ", ") +
		"). In direct sun the heat load is higher than the index; sheds, barns and protective clothing add to it."
}
