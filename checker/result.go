package checker

import (
	"welfare/records"
)

// Result is everything one check run found, and everything a report needs to
// say what was and was not checked.
type Result struct {
	Facility    string              `json:"facility"`
	Period      Period              `json:"period"`
	Fingerprint string              `json:"fingerprint"` // SHA-256 over the records, rules and limits used
	Accounting  []records.FileCount `json:"accounting"`
	Warnings    []records.Warning   `json:"warnings,omitempty"`
	Findings    []Finding           `json:"findings"` // in SortFindings order
	// Checks lists every check that was in force (evaluated or not), sorted by id.
	Checks       []CheckInfo `json:"checks"`
	NotEvaluated []Skipped   `json:"not_evaluated,omitempty"`
	// Limits are the limits in force, one line per value, with the source tag
	// from its comment in the limits file.
	Limits []LimitLine `json:"-"`
	// Care is the share of occupied enclosure-days with complete care records.
	Care CareCoverage `json:"care_coverage"`
	// Weather is the daily cold summary per weather site, for the cold-season chart.
	Weather []SiteDays `json:"-"`
	// ColdLines are the wind chills the cold checks compared against (from
	// the limits in force), for the chart's reference lines.
	ColdLines ColdLines `json:"-"`
	// FollowUp classes the findings against the previous review and holds
	// the corrective actions' status (see followup.go).
	FollowUp *FollowUp `json:"-"`
}

// ColdLines are the cold checks' wind chill thresholds (°C).
type ColdLines struct {
	Bedding, Shelter, Frostbite float64
}

// Period is the checked period, inclusive.
type Period struct {
	From records.Day `json:"from"`
	To   records.Day `json:"to"`
}

// LimitLine is one value of the limits file: "cold.bedding_days = 7  [F] ...".
type LimitLine struct {
	Key    string `json:"key"`
	Value  string `json:"value"`
	Source string `json:"source"`
}

// CareCoverage counts occupied enclosure-days and those with complete care
// records (an observed round and a feeding recorded).
type CareCoverage struct {
	OccupiedDays int `json:"occupied_enclosure_days"`
	CompleteDays int `json:"complete_days"`
}

// SiteDays is one weather site's daily minima over the period.
type SiteDays struct {
	Site string    `json:"site"`
	Days []DayCold `json:"days"`
}

// DayCold is one day at one site: the lowest air temperature and the lowest
// wind chill among that day's readings (°C). Readings is 0 on a day with none.
type DayCold struct {
	Day           records.Day `json:"day"`
	MinAirC       float64     `json:"min_air_c"`
	MinWindChillC float64     `json:"min_wind_chill_c"`
	Readings      int         `json:"readings"`
}
