package checker

import (
	"time"

	"welfare/records"
	"welfare/rules"
)

// Result is everything one check run found, and everything a report needs to
// say what was and was not checked.
type Result struct {
	Facility    string
	Period      Period
	Fingerprint string // SHA-256 over the records, rules and limits used
	Accounting  []records.FileCount
	// Rejected are the rows the loader rejected (records.Set.Problems),
	// every one, whatever --only, the rules in force or severity overrides
	// say; each is also a RejectedCheck finding.
	Rejected []records.Problem
	Warnings []records.Warning
	Findings []Finding // in SortFindings order
	// Scope: --only, the checks switched off, the limits changed, the local
	// rules (see RunScope).
	Scope RunScope
	// Checks lists every check that was in force (evaluated or not), sorted
	// by id; checks switched off by the limits are in Scope.Off instead.
	Checks       []CheckInfo
	NotEvaluated []Skipped
	// Partial lists the checks evaluated only in part: items they could not
	// judge for a missing value (records.value.missing), counted.
	Partial []Partial
	// Limits are the limits in force, one line per value, with the source tag
	// from its comment in the limits file; LimitsText is that file's text
	// (the merged text for limits laid over the defaults).
	Limits     []LimitLine
	LimitsText []byte
	// Location is the facility's time zone (nil: UTC).
	Location *time.Location
	// Care is the share of occupied enclosure-days with complete care records.
	Care CareCoverage
	// SiteOf maps the subject of a cold finding (an enclosure, a keeper or a
	// weather site) to the weather site whose chart it belongs on.
	SiteOf map[string]string
	// Weather is the daily cold summary per weather site, for the cold-season chart.
	Weather []SiteDays
	// ColdLines are the wind chills the cold checks compared against (from
	// the limits in force), for the chart's reference lines.
	ColdLines ColdLines
	// Health and Warm are the figures beside the findings for the report's
	// health and warm-season sections (result_health.go, result_warm.go).
	Health *Health
	Warm   *Warm
	// FollowUp classes the findings against the previous review and holds
	// the corrective actions' status (see followup.go).
	FollowUp *FollowUp
}

// ColdLines are the cold checks' wind chill thresholds (°C).
type ColdLines struct {
	Bedding, Shelter, Frostbite float64
}

// Period is the checked period, inclusive.
type Period struct {
	From records.Day
	To   records.Day
}

// LimitLine is one value of the limits in force (see rules.Limits.Lines).
type LimitLine = rules.LimitLine

// CareCoverage counts occupied enclosure-days and those with complete care
// records (an observed round and a feeding recorded).
type CareCoverage struct {
	OccupiedDays int `json:"occupied_enclosure_days"`
	CompleteDays int `json:"complete_days"`
}

// SiteDays is one weather site's daily minima over the period.
type SiteDays struct {
	Site string
	Days []DayCold
}

// DayCold is one day at one site: the lowest air temperature among that
// day's readings and the lowest wind chill among its readings with wind
// (°C). Readings is 0 on a day with none; WindReadings counts the readings
// with wind, and MinWindChillC means nothing when it is 0.
type DayCold struct {
	Day           records.Day
	MinAirC       float64
	MinWindChillC float64
	Readings      int
	WindReadings  int
}
