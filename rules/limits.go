package rules

import "go.yaml.in/yaml/v3"

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

	// Local holds the committee's own values for its own rules, read by
	// them as data.limits.local.NAME: lower_snake_case names, any YAML
	// value (a number, text, a list or a map). Shipped rules never read it.
	Local map[string]any `yaml:"local,omitempty" json:"local,omitempty"`

	// Species profiles by species code. A species absent here rejects the
	// animal rows that name it.
	Species map[string]Species `yaml:"species" json:"species" validate:"required,min=1,dive,keys,code,endkeys"`

	Care      Care      `yaml:"care" json:"care"`
	Handling  Handling  `yaml:"handling" json:"handling"`
	Staff     StaffLim  `yaml:"staff" json:"staff"`
	PPE       PPE       `yaml:"ppe" json:"ppe"`
	Protocol  ProtoLim  `yaml:"protocol" json:"protocol"`
	Cold      Cold      `yaml:"cold" json:"cold"`
	Cull      CullLim   `yaml:"cull" json:"cull"`
	Juveniles Juveniles `yaml:"juveniles" json:"juveniles"`
	Health    HealthLim `yaml:"health" json:"health"`
	Litter    LitterLim `yaml:"litter" json:"litter"`

	// Warm season and inside buildings.
	Heat        Heat        `yaml:"heat" json:"heat"`
	Environment Environment `yaml:"environment" json:"environment"`

	// Follow-up of earlier findings.
	Correction CorrectionLim `yaml:"correction" json:"correction"`

	// name and src are the file and text ParseLimits read (for limits laid
	// over the defaults, the merged text); doc is the file's own YAML, for
	// the lines of its keys; overlay: laid over the defaults.
	name    string
	src     []byte
	doc     *yaml.Node
	overlay bool
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
	// IndoorTempC is the air temperature range for the species in indoor
	// and sheltered buildings; nil: no range, the check does not apply.
	IndoorTempC *Range `yaml:"indoor_temp_c" json:"indoor_temp_c"`
	// Outdoor holds what the species needs when housed in an outdoor
	// building (dogs: 9 CFR §3.4); nil: nothing beyond the general checks.
	Outdoor *OutdoorLim `yaml:"outdoor" json:"outdoor"`
}

// OutdoorLim is what a species kept in outdoor housing needs.
type OutdoorLim struct {
	// Shelter: each enclosure in an outdoor building needs a shelter — a nest
	// box, or a building of exposure sheltered — in hard cold (cold.shelter.missing).
	Shelter bool `yaml:"shelter" json:"shelter"`
	// BeddingBelowC: on days whose minimum air temperature is below this,
	// bedding must have been added within the cold limits' bedding_days.
	BeddingBelowC *float64 `yaml:"bedding_below_c" json:"bedding_below_c"`
	// MoreBeddingAtOrBelowC: at or below this, additional bedding is needed
	// (quoted in the bedding finding's message).
	MoreBeddingAtOrBelowC *float64 `yaml:"more_bedding_at_or_below_c" json:"more_bedding_at_or_below_c"`
	// NotAcclimatedBelowC: animals not acclimated (or of breeds that cannot
	// tolerate the cold) are not kept outdoors below this. The records do not
	// say which animals are acclimated, so no check reads it yet; it is shown
	// among the limits in force.
	NotAcclimatedBelowC *float64 `yaml:"not_acclimated_below_c" json:"not_acclimated_below_c"`
}

// Space is the floor space and height a species needs. Either the per-occupant
// areas or the formula apply.
type Space struct {
	AdultM2         float64 `yaml:"adult_m2" json:"adult_m2" validate:"gte=0"`
	JuvenileM2      float64 `yaml:"juvenile_m2" json:"juvenile_m2" validate:"gte=0"`
	DamWithLitterM2 float64 `yaml:"dam_with_litter_m2" json:"dam_with_litter_m2" validate:"gte=0"`
	MinHeightCm     float64 `yaml:"min_height_cm" json:"min_height_cm" validate:"gte=0"`
	// MinCageM2: no enclosure holding this species may be smaller, whatever
	// its occupants (0: no minimum beyond the occupants' areas).
	MinCageM2 float64 `yaml:"min_cage_m2" json:"min_cage_m2" validate:"gte=0"`
	// Formula names a published area formula instead of fixed areas:
	// "9cfr_3_6_dog" is ft² = (length in + 6)² / 144.
	Formula string `yaml:"formula" json:"formula" validate:"omitempty,oneof=9cfr_3_6_dog"`
	// NursingPuppyPct: a dam with litter of a formula species needs this
	// percentage of her own formula area more for each juvenile of her
	// species in the enclosure (9 CFR §3.6(c)(1)(ii): set by the attending
	// veterinarian).
	NursingPuppyPct float64 `yaml:"nursing_puppy_pct" json:"nursing_puppy_pct" validate:"gte=0"`
	// Group: per-animal areas by body mass for animals housed with others
	// of their species, used where larger than the formula.
	Group *GroupSpace `yaml:"group" json:"group"`
}

// GroupSpace is a per-animal floor area by body mass for animals housed in
// pairs or groups: below SmallBelowKg SmallM2, above LargeAboveKg LargeM2,
// otherwise MediumM2.
type GroupSpace struct {
	SmallBelowKg float64 `yaml:"small_below_kg" json:"small_below_kg" validate:"gt=0"`
	SmallM2      float64 `yaml:"small_m2" json:"small_m2" validate:"gt=0"`
	MediumM2     float64 `yaml:"medium_m2" json:"medium_m2" validate:"gt=0"`
	LargeAboveKg float64 `yaml:"large_above_kg" json:"large_above_kg" validate:"gtfield=SmallBelowKg"`
	LargeM2      float64 `yaml:"large_m2" json:"large_m2" validate:"gt=0"`
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
	// GeneralAnaesthesia: the animal must be under general anaesthesia
	// first (culls.csv anaesthetised: yes); sedation is not enough.
	GeneralAnaesthesia bool `yaml:"general_anaesthesia" json:"general_anaesthesia"`
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
	ConcernAnsweredBy []string `yaml:"concern_answered_by" json:"concern_answered_by" validate:"dive,code,purpose"`
	// An occupied enclosure with no cleaning for more than this many days is overdue.
	CleanEveryDays int `yaml:"clean_every_days" json:"clean_every_days" validate:"gte=1"`
}

// Handling holds the handling-event limits.
type Handling struct {
	AcceptedGloves       []string `yaml:"accepted_gloves" json:"accepted_gloves" validate:"min=1,dive,code,glove"`
	MinGloveMm           float64  `yaml:"min_glove_thickness_mm" json:"min_glove_thickness_mm" validate:"gte=0"`
	UnconsciousRestraint []string `yaml:"unconscious_restraint" json:"unconscious_restraint" validate:"dive,code,restraint"`
	// RequiredPPE by purpose; the key "default" applies to every purpose not listed.
	RequiredPPE map[string][]string `yaml:"required_ppe" json:"required_ppe" validate:"dive,keys,code,purpose_or_default,endkeys,dive,code,ppe_item"`
	// MaxDurationMin by purpose; a purpose not listed has no maximum.
	MaxDurationMin map[string]float64 `yaml:"max_duration_min" json:"max_duration_min" validate:"dive,keys,code,purpose,endkeys,gt=0"`
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
	InspectionDays map[string]int `yaml:"inspection_days" json:"inspection_days" validate:"dive,keys,code,item_kind,endkeys,gte=1"`
}

// ProtoLim holds protocol limits.
type ProtoLim struct {
	ExpiringWithinDays int `yaml:"expiring_within_days" json:"expiring_within_days" validate:"gte=0"`
	// ReviewEveryMonths: an event under a protocol more than this many
	// months after its last continuing review (or approval) is overdue.
	ReviewEveryMonths int `yaml:"review_every_months" json:"review_every_months" validate:"gte=1"`
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
	// ReadingWithinHours: a stint is judged on the latest reading at or
	// before its start no more than this many hours before it (exactly this
	// many counts); without one it is not judged (records.value.missing).
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

// HealthLim holds the limits of the health checks (deaths, weights, body
// condition, signs, behaviour, veterinary cases, mortality).
type HealthLim struct {
	// A death must be notified to the attending veterinarian within this many hours.
	NotifyVetWithinHours float64 `yaml:"notify_vet_within_hours" json:"notify_vet_within_hours" validate:"gt=0"`
	// A mass at least WeightLossPct below the highest of the preceding
	// WeightLossDays is a finding; significant at WeightLossSignificantPct.
	WeightLossPct            float64 `yaml:"weight_loss_pct" json:"weight_loss_pct" validate:"gt=0,lt=100"`
	WeightLossSignificantPct float64 `yaml:"weight_loss_significant_pct" json:"weight_loss_significant_pct" validate:"gt=0,lt=100"`
	WeightLossDays           int     `yaml:"weight_loss_days" json:"weight_loss_days" validate:"gte=1"`
	// Body condition (1-5) at or below ConditionPoorMax is poor; at or below
	// ConditionSevereMax significant.
	ConditionPoorMax   int `yaml:"condition_poor_max" json:"condition_poor_max" validate:"gte=1,lte=5"`
	ConditionSevereMax int `yaml:"condition_severe_max" json:"condition_severe_max" validate:"gte=1,lte=5"`
	// Signs that need a veterinarian, the handling purposes that answer them,
	// within how many hours, or a case opened within how many days.
	NeedsVet         []string `yaml:"needs_vet" json:"needs_vet" validate:"dive,code,sign"`
	SignsAnsweredBy  []string `yaml:"signs_answered_by" json:"signs_answered_by" validate:"dive,code,purpose"`
	SignsAnswerHours float64  `yaml:"signs_answer_hours" json:"signs_answer_hours" validate:"gt=0"`
	SignsCaseDays    int      `yaml:"signs_case_days" json:"signs_case_days" validate:"gte=0"`
	// Abnormal behaviour: BehaviourCount observations with one of
	// BehaviourSigns within BehaviourDays.
	BehaviourSigns []string `yaml:"behaviour_signs" json:"behaviour_signs" validate:"min=1,dive,code,sign"`
	BehaviourCount int      `yaml:"behaviour_count" json:"behaviour_count" validate:"gte=1"`
	BehaviourDays  int      `yaml:"behaviour_days" json:"behaviour_days" validate:"gte=1"`
	// An open case needs a veterinarian's review at least every CaseReviewDays.
	CaseReviewDays int          `yaml:"case_review_days" json:"case_review_days" validate:"gte=1"`
	Mortality      MortalityLim `yaml:"mortality" json:"mortality"`
}

// MortalityLim: a building's deaths in a calendar month are high when at
// least MinDeaths and above MonthlyPct of its mean daily population.
type MortalityLim struct {
	MinDeaths  int     `yaml:"min_deaths" json:"min_deaths" validate:"gte=1"`
	MonthlyPct float64 `yaml:"monthly_pct" json:"monthly_pct" validate:"gt=0"`
}

// LitterLim holds the breeding limits.
type LitterLim struct {
	// MinWeaningDays by species code: young are not separated from the dam earlier.
	MinWeaningDays map[string]int `yaml:"min_weaning_days" json:"min_weaning_days" validate:"dive,keys,code,endkeys,gte=1"`
	// LitterLossPct: (born - weaned) / born above this is a finding.
	LitterLossPct float64 `yaml:"litter_loss_pct" json:"litter_loss_pct" validate:"gt=0,lte=100"`
}

// Range is an inclusive range of values: a value below Min or above Max is
// outside it.
type Range struct {
	Min float64 `yaml:"min" json:"min"`
	Max float64 `yaml:"max" json:"max" validate:"gtefield=Min"`
}

// Heat holds the warm-season limits.
type Heat struct {
	// HotDayC: a day whose maximum air temperature (water checks) or
	// heat index (shade) reaches this is a hot day.
	HotDayC float64 `yaml:"hot_day_c" json:"hot_day_c"`
	// WaterChecksMin: rounds that record a water state on a hot day.
	WaterChecksMin int `yaml:"water_checks_min" json:"water_checks_min" validate:"gte=1"`
	// DangerHeatIndexC: a day whose maximum heat index reaches this gives a
	// weather-site note.
	DangerHeatIndexC float64 `yaml:"danger_heat_index_c" json:"danger_heat_index_c"`
}

// Environment holds the limits on the air inside buildings.
type Environment struct {
	// HoursOutside: readings outside a species' indoor_temp_c range for
	// strictly more than this many consecutive hours are a finding.
	HoursOutside float64 `yaml:"hours_outside" json:"hours_outside" validate:"gte=0"`
	// HumidityPct: relative humidity range for indoor buildings.
	HumidityPct Range `yaml:"humidity_pct" json:"humidity_pct"`
	// AmmoniaPpmMax: a reading above this is a finding.
	AmmoniaPpmMax float64 `yaml:"ammonia_ppm_max" json:"ammonia_ppm_max" validate:"gte=0"`
}

// CullLim holds the euthanasia limits that are not per species.
type CullLim struct {
	// DeathConfirmationMinSigns: without rigor mortis or a secondary method,
	// at least this many distinct signs must confirm death.
	DeathConfirmationMinSigns int `yaml:"death_confirmation_min_signs" json:"death_confirmation_min_signs" validate:"gte=1"`
}

// CorrectionLim holds the limits of the follow-up of earlier findings.
type CorrectionLim struct {
	// OverdueAfterDays: an action open (or closed) more than this many days
	// after its due date is overdue.
	OverdueAfterDays int `yaml:"overdue_after_days" json:"overdue_after_days" validate:"gte=0"`
	// RecurredAfterDays: a finding of the problem more than this many days
	// after its action was closed means the problem came back.
	RecurredAfterDays int `yaml:"recurred_after_days" json:"recurred_after_days" validate:"gte=0"`
}
