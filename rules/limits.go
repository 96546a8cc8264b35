package rules

// Limits is limits.yaml: the facility's own welfare limits. The shipped
// defaults carry their source in a comment beside each value. Rules read the
// same document as data.limits; the Go facts read it through this type.
//
// Field names are the YAML keys; decoding is strict, so a misspelt key is an
// error with its line rather than a limit silently left at its default.
type Limits struct {
	// Severity overrides a check's severity: check id -> significant, minor,
	// note, or off (the check is not reported).
	Severity map[string]string `yaml:"severity" json:"severity" validate:"dive,keys,check_id,endkeys,oneof=significant minor note off"`

	// Species profiles by species code. A species absent here rejects the
	// animal rows that name it.
	Species map[string]Species `yaml:"species" json:"species" validate:"required,min=1,dive,keys,code,endkeys"`

	Care      Care      `yaml:"care" json:"care"`
	Handling  Handling  `yaml:"handling" json:"handling"`
	Staff     StaffLim  `yaml:"staff" json:"staff"`
	PPE       PPE       `yaml:"ppe" json:"ppe"`
	Protocol  ProtoLim  `yaml:"protocol" json:"protocol"`
	Cold      Cold      `yaml:"cold" json:"cold"`
	Juveniles Juveniles `yaml:"juveniles" json:"juveniles"`

	// name and src are the file and text ParseLimits read.
	name string
	src  []byte
}

// Species is one species profile.
type Species struct {
	Name  string `yaml:"name" json:"name" validate:"required"`
	Space Space  `yaml:"space" json:"space"`
	// NestBox and Platform: the species requires them in its enclosure.
	NestBox  bool `yaml:"nest_box" json:"nest_box"`
	Platform bool `yaml:"platform" json:"platform"`
	// FeedEveryDays: an unfed run of this many days is a finding.
	FeedEveryDays int `yaml:"feed_every_days" json:"feed_every_days" validate:"gte=1"`
	// BiteRisk: conscious handling needs bite-resistant gloves.
	BiteRisk bool `yaml:"bite_risk" json:"bite_risk"`
	// RabiesRisk: handlers need rabies pre-exposure prophylaxis.
	RabiesRisk bool       `yaml:"rabies_risk" json:"rabies_risk"`
	Euthanasia Euthanasia `yaml:"euthanasia" json:"euthanasia"`
}

// Space is the floor space and height a species needs. Either the per-occupant
// areas or the formula apply.
type Space struct {
	AdultM2         float64 `yaml:"adult_m2" json:"adult_m2" validate:"gte=0"`
	JuvenileM2      float64 `yaml:"juvenile_m2" json:"juvenile_m2" validate:"gte=0"`
	DamWithLitterM2 float64 `yaml:"dam_with_litter_m2" json:"dam_with_litter_m2" validate:"gte=0"`
	MinHeightCm     float64 `yaml:"min_height_cm" json:"min_height_cm" validate:"gte=0"`
	// Formula names a published area formula instead of fixed areas:
	// "9cfr_3_6_dog" is ft² = (length in + 6)² / 144.
	Formula string `yaml:"formula" json:"formula" validate:"omitempty,oneof=9cfr_3_6_dog"`
}

// Euthanasia classifies methods for a species. A method in none of the
// lists is unacceptable.
type Euthanasia struct {
	Acceptable []string `yaml:"acceptable" json:"acceptable" validate:"dive,code"`
	// Conditional methods are acceptable only when their conditions are met.
	Conditional  map[string]MethodConditions `yaml:"conditional" json:"conditional" validate:"dive,keys,code,endkeys"`
	Unacceptable []string                    `yaml:"unacceptable" json:"unacceptable" validate:"dive,code"`
}

// MethodConditions are what a conditionally acceptable method needs.
type MethodConditions struct {
	// Sedation: the animal must be sedated or anaesthetised first.
	Sedation bool `yaml:"sedation" json:"sedation"`
	// SecondaryMethod: death must be ensured by a secondary method.
	SecondaryMethod bool `yaml:"secondary_method" json:"secondary_method"`
	// Note is shown with findings (e.g. "purpose-built device only").
	Note string `yaml:"note" json:"note"`
}

// Juveniles sets the age below which an animal without a recorded
// life_stage is a juvenile.
type Juveniles struct {
	UnderMonths int `yaml:"under_months" json:"under_months" validate:"gte=0"`
}

// Care holds the daily-care limits.
type Care struct {
	// A run of unobserved (or unfed) days this long or longer is significant.
	SignificantRunDays int `yaml:"significant_run_days" json:"significant_run_days" validate:"gte=1"`
	// A health concern must be answered by a check of the animal within this many hours.
	ConcernResponseHours float64 `yaml:"concern_response_hours" json:"concern_response_hours" validate:"gt=0"`
	// Handling purposes that answer a health concern.
	ConcernAnsweredBy []string `yaml:"concern_answered_by" json:"concern_answered_by" validate:"dive,code"`
}

// Handling holds the handling-event limits.
type Handling struct {
	AcceptedGloves       []string `yaml:"accepted_gloves" json:"accepted_gloves" validate:"min=1,dive,code"`
	MinGloveMm           float64  `yaml:"min_glove_thickness_mm" json:"min_glove_thickness_mm" validate:"gte=0"`
	UnconsciousRestraint []string `yaml:"unconscious_restraint" json:"unconscious_restraint" validate:"dive,code"`
	// RequiredPPE by purpose; the key "default" applies to every purpose not listed.
	RequiredPPE map[string][]string `yaml:"required_ppe" json:"required_ppe" validate:"dive,keys,code,endkeys,dive,code"`
	// MaxDurationMin by purpose; a purpose not listed has no maximum.
	MaxDurationMin map[string]float64 `yaml:"max_duration_min" json:"max_duration_min" validate:"dive,keys,code,endkeys,gt=0"`
	// A bite or scratch must be reported within this many hours.
	ReportWithinHours float64 `yaml:"report_within_hours" json:"report_within_hours" validate:"gt=0"`
}

// StaffLim holds the limits on people.
type StaffLim struct {
	HandlingTrainingMonths   int         `yaml:"handling_training_months" json:"handling_training_months" validate:"gte=1"`
	EuthanasiaTrainingMonths int         `yaml:"euthanasia_training_months" json:"euthanasia_training_months" validate:"gte=1"`
	RespiratorFitMonths      int         `yaml:"respirator_fit_months" json:"respirator_fit_months" validate:"gte=1"`
	Rabies                   RabiesLimit `yaml:"rabies" json:"rabies"`
}

// RabiesLimit selects the ACIP 2022 pre-exposure prophylaxis risk category.
type RabiesLimit struct {
	// RiskCategory 1-4 (ACIP 2022). 1: titer every 6 months; 2: every 24
	// months; 3: one titer between year 1 and 3, or a booster between day
	// 21 and year 3; 4: primary series only.
	RiskCategory int `yaml:"risk_category" json:"risk_category" validate:"gte=1,lte=4"`
	// MinTiterIUmL: a titer below this needs a booster.
	MinTiterIUmL float64 `yaml:"min_titer_iu_ml" json:"min_titer_iu_ml" validate:"gt=0"`
	// TiterEveryMonths by category for the periodic-titer categories.
	TiterEveryMonths map[int]int `yaml:"titer_every_months" json:"titer_every_months" validate:"dive,keys,gte=1,lte=2,endkeys,gte=1"`
}

// PPE holds protective-equipment limits.
type PPE struct {
	// InspectionDays by item kind: an item used with no check in this many
	// days up to the day of use is overdue.
	InspectionDays map[string]int `yaml:"inspection_days" json:"inspection_days" validate:"dive,keys,code,endkeys,gte=1"`
}

// ProtoLim holds protocol limits.
type ProtoLim struct {
	ExpiringWithinDays int `yaml:"expiring_within_days" json:"expiring_within_days" validate:"gte=0"`
}

// Cold holds the cold-season limits.
type Cold struct {
	// Water: below this day's minimum air temperature, an outdoor enclosure
	// needs WaterChecksMin rounds that record a water state.
	WaterCheckBelowC float64 `yaml:"water_check_below_c" json:"water_check_below_c"`
	WaterChecksMin   int     `yaml:"water_checks_min" json:"water_checks_min" validate:"gte=1"`
	// Bedding: at or below this wind chill, bedding must have been added in the last BeddingDays days.
	BeddingWindChill float64 `yaml:"bedding_wind_chill" json:"bedding_wind_chill"`
	BeddingDays      int     `yaml:"bedding_days" json:"bedding_days" validate:"gte=1"`
	// Shelter: at or below this wind chill, nest-box species need their nest box.
	ShelterWindChill float64 `yaml:"shelter_wind_chill" json:"shelter_wind_chill"`
	// Frostbite: at or below this wind chill a weather-site note is given.
	FrostbiteWindChill float64 `yaml:"frostbite_wind_chill" json:"frostbite_wind_chill"`
	// ReadingWithinHours: a stint uses the latest reading at or before its
	// start within this many hours, else the nearest reading.
	ReadingWithinHours float64    `yaml:"reading_within_hours" json:"reading_within_hours" validate:"gt=0"`
	WorkWarmup         WorkWarmup `yaml:"work_warmup" json:"work_warmup"`
}

// WorkWarmup is a work/warm-up schedule for a 4-hour shift (the ACGIH TLV
// table by default). Rows run warmest first.
type WorkWarmup struct {
	// WindColumnsKmh are the column heads: a wind uses the first column at
	// or above it; winds above the last use the last.
	WindColumnsKmh []float64 `yaml:"wind_columns_kmh" json:"wind_columns_kmh" validate:"min=1"`
	// Rows: a rounded-down air temperature T uses the coldest row whose
	// WarmestC is at or above T; T warmer than the first row has no limit.
	Rows []WarmupRow `yaml:"rows" json:"rows" validate:"min=1,dive"`
}

// WarmupRow is one air-temperature row. Each cell is "N" (normal breaks),
// "C" (non-emergency work should cease) or "MAX/BREAKS" in minutes and
// 10-minute warm-up breaks, e.g. "40/4".
type WarmupRow struct {
	WarmestC float64  `yaml:"warmest_c" json:"warmest_c"`
	Cells    []string `yaml:"cells" json:"cells" validate:"min=1,dive,warmup_cell"`
}
