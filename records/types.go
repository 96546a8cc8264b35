package records

import (
	"time"
)

// Ref points at the CSV record (or YAML line) a value came from, as "FILE:LINE"
// with the header on line 1. Findings cite refs as their evidence.
type Ref string

// Bool is a recorded yes/no that remembers when nothing was recorded:
// "not recorded" and "no" are different answers on a welfare record.
type Bool int8

const (
	NotRecorded Bool = iota
	No
	Yes
)

// IsYes reports whether the record says yes; not recorded counts as no
// wherever a check needs a yes.
func (b Bool) IsYes() bool { return b == Yes }

func (b Bool) String() string {
	switch b {
	case Yes:
		return "yes"
	case No:
		return "no"
	}
	return ""
}

// Set is one facility's records after loading: every accepted row, every
// rejected row's problem, and the per-file accounting.
type Set struct {
	Facility   Facility
	Location   *time.Location // the facility's time zone
	Animals    []Animal
	Enclosures []Enclosure
	Housing    []Housing
	Staff      []Staff
	Protocols  []Protocol
	// Care are care rounds of a set made by hand. Load leaves it empty and
	// keeps the rounds of daily_care compactly instead: read rounds
	// through CareRounds, which serves both.
	Care         []CareRound
	Handling     []Handling
	PPEChecks    []PPECheck
	Weather      []Weather
	Work         []OutdoorWork
	Culls        []Cull
	Deaths       []Death
	Observations []Observation
	Treatments   []Treatment
	Litters      []Litter
	// Environment are the readings of environment.csv.
	Environment []EnvironmentReading
	// CorrectiveActions are the committee's plans (corrective_actions.csv).
	CorrectiveActions []CorrectiveAction

	// Present names the record files that exist in the folder (even when
	// empty), so a check can tell "not evaluated" from "passed".
	Present map[string]bool
	// Columns lists, per file read, the columns it had (SI names), so a
	// check can tell a column never recorded from a column left empty.
	Columns map[string][]string
	// Accounting has one entry per file read, in a stable order.
	Accounting []FileCount
	// Problems are the rejected rows and file-level errors, in file then line order.
	Problems []Problem
	// Warnings are unknown files and columns: nothing was lost, but something was not read.
	Warnings []Warning
	// Extra holds the committee's own columns (names starting with x_) of
	// each accepted row, by the row's ref, as text: the checker gives them
	// to the rules as the extra object of the subject or event the row
	// belongs to. Nil when no file has such a column.
	Extra map[Ref]map[string]string

	// care is the store Load fills with the accepted rounds of daily_care.
	care *CareRounds
}

// CareRounds returns the care rounds of the set: the store Load filled
// (the rows of Care after it, if any were added by hand), or, for a set
// made by hand, a store built from Care on each call, so build it once and
// keep it where it is read more than once.
func (s *Set) CareRounds() *CareRounds {
	switch {
	case s.care == nil:
		return NewCareRounds(s.Care, s.Location)
	case len(s.Care) > 0:
		return NewCareRounds(append(s.care.Rounds(), s.Care...), s.care.loc)
	}
	return s.care
}

// DropCare lets go of the care rounds, the hand-made ones and the loader's
// store, for a caller that has read all it needs of them (the checker, once
// its facts are built): they are most of a loaded set's memory.
func (s *Set) DropCare() { s.Care, s.care = nil, nil }

// FileCount is the row accounting of one file: Read == Accepted + Rejected.
type FileCount struct {
	File     string `json:"file"`
	Read     int    `json:"read"`
	Accepted int    `json:"accepted"`
	Rejected int    `json:"rejected"`
	// Failed is set when the whole file could not be used (a missing
	// required column, an unreadable file); its rows count as rejected.
	Failed string `json:"failed,omitempty"`
}

// Facility is facility.yaml.
type Facility struct {
	Name         string     `yaml:"name" validate:"required"`
	TimeZone     string     `yaml:"time_zone" validate:"required"`
	Buildings    []Building `yaml:"buildings" validate:"required,dive"`
	WeatherSites []string   `yaml:"weather_sites" validate:"dive,id"`
	// RoundTimes are when the day's care rounds are due; the morning view
	// counts a round, feeding or water check as missing only once its
	// round is due.
	RoundTimes RoundTimes `yaml:"round_times"`
}

// Building is a shed, barn or room.
type Building struct {
	ID          string `yaml:"id" validate:"required,id"`
	Exposure    string `yaml:"exposure" validate:"required,oneof=outdoor sheltered indoor"`
	WeatherSite string `yaml:"weather_site" validate:"omitempty,id"`
	Line        int    `yaml:"-"`
}

// Animal is a row of animals.csv.
type Animal struct {
	Ref         Ref
	ID          string   `csv:"animal_id,required" validate:"required,id"`
	Species     string   `csv:"species,required" validate:"required,code"`
	Sex         string   `csv:"sex" validate:"omitempty,oneof=f m u"`
	BornOn      Day      `csv:"born_on"`
	ArrivedOn   Day      `csv:"arrived_on,required" validate:"required"`
	LeftOn      Day      `csv:"left_on"`
	LeftReason  string   `csv:"left_reason" validate:"omitempty,oneof=culled died transferred sold released"`
	EnclosureID string   `csv:"enclosure_id" validate:"omitempty,id"`
	ProtocolID  string   `csv:"protocol_id" validate:"omitempty,id"`
	MassKg      *float64 `csv:"mass,unit=mass" validate:"omitempty,gt=0,lte=200"`
	LengthCm    *float64 `csv:"length,unit=length" validate:"omitempty,gt=0,lte=300"`
	LifeStage   string   `csv:"life_stage" validate:"omitempty,oneof=adult juvenile dam_with_litter"`
}

// Enclosure is a row of enclosures.csv.
type Enclosure struct {
	Ref          Ref
	ID           string   `csv:"enclosure_id,required" validate:"required,id"`
	BuildingID   string   `csv:"building_id,required" validate:"required,id"`
	Kind         string   `csv:"kind,required" validate:"required,oneof=cage pen run room"`
	LengthCm     *float64 `csv:"length,unit=length" validate:"omitempty,gt=0,lte=5000"`
	WidthCm      *float64 `csv:"width,unit=length" validate:"omitempty,gt=0,lte=5000"`
	FloorAreaM2  *float64 `csv:"floor_area,unit=area" validate:"omitempty,gt=0,lte=10000"`
	HeightCm     float64  `csv:"height,unit=length,required" validate:"gt=0,lte=5000"`
	MaxOccupants int      `csv:"max_occupants" validate:"omitempty,gte=1"`
	NestBox      Bool     `csv:"nest_box"`
	Platform     Bool     `csv:"platform"`
	Shade        Bool     `csv:"shade"` // outdoor enclosure shaded from direct sun
}

// Area is the usable floor area in m²: floor_area_m2 when given, else length × width.
func (e Enclosure) Area() float64 {
	if e.FloorAreaM2 != nil {
		return *e.FloorAreaM2
	}
	if e.LengthCm != nil && e.WidthCm != nil {
		return *e.LengthCm * *e.WidthCm / 10000
	}
	return 0
}

// Housing is a row of housing.csv: one animal's stay in one enclosure.
type Housing struct {
	Ref         Ref
	AnimalID    string `csv:"animal_id,required" validate:"required,id"`
	EnclosureID string `csv:"enclosure_id,required" validate:"required,id"`
	MovedInOn   Day    `csv:"moved_in_on,required" validate:"required"`
	MovedOutOn  Day    `csv:"moved_out_on"` // zero: still there
}

// Staff is a row of staff.csv.
type Staff struct {
	Ref                 Ref
	ID                  string   `csv:"staff_id,required" validate:"required,id"`
	Name                string   `csv:"name,required" validate:"required"`
	Role                string   `csv:"role,required" validate:"required,oneof=keeper technician veterinarian supervisor other"`
	ActiveFrom          Day      `csv:"active_from"`
	ActiveTo            Day      `csv:"active_to"`
	HandlingTrainedOn   Day      `csv:"handling_trained_on"`
	EuthanasiaTrainedOn Day      `csv:"euthanasia_trained_on"`
	EuthanasiaMethods   []string `csv:"euthanasia_methods" validate:"dive,code"`
	RabiesPrimaryOn     Day      `csv:"rabies_primary_on"`
	RabiesTiterOn       Day      `csv:"rabies_titer_on"`
	RabiesTiterIUmL     *float64 `csv:"rabies_titer_iu_ml" validate:"omitempty,gte=0,lte=1000"`
	RabiesBoosterOn     Day      `csv:"rabies_booster_on"`
	RespiratorFitOn     Day      `csv:"respirator_fit_on"`
	// RabiesRiskCategory is the ACIP 2022 risk category (1-5) of this
	// person's work; nil: the limits' facility-wide category.
	RabiesRiskCategory *int `csv:"rabies_risk_category" validate:"omitempty,gte=1,lte=5"`
}

// Protocol is a row of protocols.csv.
type Protocol struct {
	Ref               Ref
	ID                string   `csv:"protocol_id,required" validate:"required,id"`
	Title             string   `csv:"title,required" validate:"required"`
	ApprovedOn        Day      `csv:"approved_on,required" validate:"required"`
	ExpiresOn         Day      `csv:"expires_on,required" validate:"required"`
	Species           []string `csv:"species" validate:"dive,code"`
	MaxAnimals        *int     `csv:"max_animals" validate:"omitempty,gte=0"`
	Procedures        []string `csv:"procedures" validate:"dive,oneof=temperament_test health_check vet_exam treatment weighing transfer breeding sampling other"`
	EuthanasiaMethods []string `csv:"euthanasia_methods" validate:"dive,code"`
	// Personnel are the staff ids approved to work under the protocol.
	Personnel []string `csv:"personnel" validate:"dive,id"`
	// LastReviewedOn is the committee's latest continuing review.
	LastReviewedOn Day `csv:"last_reviewed_on"`
	// PainCategory is the USDA pain and distress category of the
	// protocol's most invasive procedure.
	PainCategory string `csv:"pain_category" validate:"omitempty,oneof=B C D E"`
}

// CareRound is a row of daily_care.csv. A round names an enclosure or a
// whole building.
type CareRound struct {
	Ref             Ref
	At              time.Time `csv:"checked_at"` // for a date-only row, midnight local
	Day             Day       `csv:"date"`       // the local day of the round
	DateOnly        bool      // the row gave a date, not a time
	EnclosureID     string    `csv:"enclosure_id" validate:"omitempty,id"`
	BuildingID      string    `csv:"building_id" validate:"omitempty,id"`
	StaffID         string    `csv:"staff_id,required" validate:"required,id"`
	Observed        Bool      `csv:"observed,required"`
	Fed             Bool      `csv:"fed"`
	FeedG           *float64  `csv:"feed,unit=grams" validate:"omitempty,gte=0,lte=10000"`
	Water           string    `csv:"water" validate:"omitempty,oneof=ok low empty frozen not_checked"`
	WaterRestored   Bool      `csv:"water_restored"`
	BeddingAdded    Bool      `csv:"bedding_added"`
	Cleaned         Bool      `csv:"cleaned"`
	HealthConcern   Bool      `csv:"health_concern"`
	ConcernAnimalID string    `csv:"concern_animal_id" validate:"omitempty,id"`
	Notes           string    `csv:"notes"`
}

// Handling is a row of handling.csv.
type Handling struct {
	Ref                Ref
	At                 time.Time `csv:"handled_at,required"`
	AnimalID           string    `csv:"animal_id,required" validate:"required,id"`
	StaffID            string    `csv:"staff_id,required" validate:"required,id"`
	Purpose            string    `csv:"purpose,required" validate:"required,oneof=temperament_test health_check vet_exam treatment weighing transfer breeding sampling other"`
	Restraint          string    `csv:"restraint" validate:"omitempty,oneof=none gloved_hand net restraint_box sedation anaesthesia"`
	DurationMin        *float64  `csv:"duration,unit=duration" validate:"omitempty,gte=0,lte=1440"`
	Glove              string    `csv:"glove" validate:"omitempty,oneof=none nitrile leather bite_resistant gauntlet"`
	GloveID            string    `csv:"glove_id" validate:"omitempty,id"`
	GloveThicknessMm   *float64  `csv:"glove_thickness,unit=thickness" validate:"omitempty,gt=0,lte=100"`
	PPE                []string  `csv:"ppe" validate:"dive,oneof=coverall gown apron face_shield eye_protection mask respirator boots"`
	Bite               Bool      `csv:"bite"`
	Scratch            Bool      `csv:"scratch"`
	WoundWashed        Bool      `csv:"wound_washed"`
	ExposureReportedAt time.Time `csv:"exposure_reported_at"` // zero: not recorded
	ProtocolID         string    `csv:"protocol_id" validate:"omitempty,id"`
}

// PPECheck is a row of ppe_checks.csv.
type PPECheck struct {
	Ref        Ref
	CheckedOn  Day    `csv:"checked_on,required" validate:"required"`
	ItemID     string `csv:"item_id,required" validate:"required,id"`
	Item       string `csv:"item,required" validate:"required,oneof=glove gauntlet respirator face_shield coverall other"`
	AssignedTo string `csv:"assigned_to" validate:"omitempty,id"`
	Condition  string `csv:"condition,required" validate:"required,oneof=good worn damaged"`
	Action     string `csv:"action" validate:"omitempty,oneof=kept repaired replaced withdrawn"`
}

// Weather is a row of weather.csv, in SI units.
type Weather struct {
	Ref      Ref
	At       time.Time `csv:"observed_at,required"`
	SiteID   string    `csv:"site_id,required" validate:"required,id"`
	AirTempC float64   `csv:"air_temp,unit=temperature,required" validate:"gte=-80,lte=60"`
	WindKmh  *float64  `csv:"wind,unit=speed" validate:"omitempty,gte=0,lte=250"`
	// HumidityPct is the relative humidity, for the heat index.
	HumidityPct *float64 `csv:"humidity_pct" validate:"omitempty,gte=0,lte=100"`
}

// OutdoorWork is a row of outdoor_work.csv: one continuous outdoor stint.
type OutdoorWork struct {
	Ref       Ref
	StaffID   string    `csv:"staff_id,required" validate:"required,id"`
	StartedAt time.Time `csv:"started_at,required"`
	EndedAt   time.Time `csv:"ended_at,required"`
	SiteID    string    `csv:"site_id,required" validate:"required,id"`
	Activity  string    `csv:"activity" validate:"omitempty,oneof=light moderate heavy"` // empty: moderate
	Emergency Bool      `csv:"emergency"`
}

// Cull is a row of culls.csv.
type Cull struct {
	Ref      Ref
	At       time.Time `csv:"culled_at,required"`
	AnimalID string    `csv:"animal_id,required" validate:"required,id"`
	StaffID  string    `csv:"staff_id,required" validate:"required,id"`
	Reason   string    `csv:"reason,required" validate:"required,oneof=breeding_selection health humane_endpoint end_of_study pelting other"`
	Method   string    `csv:"method,required" validate:"required,code"`
	Sedated  Bool      `csv:"sedated"`
	// Anaesthetised: under general anaesthesia (no pedal or corneal reflex)
	// before the method; sedation is not enough where a method needs this.
	Anaesthetised  Bool     `csv:"anaesthetised"`
	DeathConfirmed Bool     `csv:"death_confirmed"`
	Confirmation   []string `csv:"confirmation" validate:"dive,oneof=no_heartbeat no_breathing no_corneal_reflex no_pedal_reflex rigor_mortis secondary_method"`
	ProtocolID     string   `csv:"protocol_id" validate:"omitempty,id"`
	Disposal       string   `csv:"disposal" validate:"omitempty,oneof=rendering incineration burial necropsy other"`
}

// Problem is one rejected row or file-level error, positioned for a keeper
// to find and fix: "daily_care.csv:212: water: "frozn" is not one of ...".
type Problem struct {
	File   string `json:"file"`
	Line   int    `json:"line"`             // 0 for a whole-file problem
	Column string `json:"column,omitempty"` // the CSV column or YAML key
	Value  string `json:"value,omitempty"`  // the offending cell, as written
	Reason string `json:"reason"`
	// Day is the row's date when it could be read (zero otherwise), so a
	// rejected row can be placed in the checked period.
	Day Day `json:"-"`
	// At is the place inside a workbook, "daily_care!C212" (sheet, cell) or
	// "daily_care!212" for a whole row; empty for CSV files and facility.yaml,
	// whose Line says it all.
	At string `json:"at,omitempty"`
	// Kind names a problem that repeats across rows ("decimal_comma",
	// "date_order", "not_utf8", "unknown_reference"), so that a terminal
	// can group them (GroupProblems); empty for the rest.
	Kind string `json:"-"`
}

// Warning is something read but not used: an unknown file or column.
type Warning struct {
	File    string `json:"file"`
	Column  string `json:"column,omitempty"`
	Message string `json:"message"`
}

// Death is a row of deaths.csv: an animal that died or was found dead (not a cull).
type Death struct {
	Ref            Ref
	AnimalID       string    `csv:"animal_id,required" validate:"required,id"`
	FoundDeadAt    time.Time `csv:"found_dead_at,required"`
	FoundBy        string    `csv:"found_by,required" validate:"required,id"`
	SuspectedCause string    `csv:"suspected_cause" validate:"omitempty,oneof=unknown injury disease cold heat whelping fight other"` // empty: unknown
	VetNotifiedAt  time.Time `csv:"vet_notified_at"`                                                                                  // zero: not recorded
	Necropsy       Bool      `csv:"necropsy"`
	NecropsyRef    string    `csv:"necropsy_ref"`
	Disposal       string    `csv:"disposal" validate:"omitempty,oneof=rendering incineration burial necropsy other"`
}

// Observation is a row of observations.csv: a clinical or welfare
// observation of one animal, in SI units.
type Observation struct {
	Ref           Ref
	At            time.Time `csv:"observed_at,required"`
	AnimalID      string    `csv:"animal_id,required" validate:"required,id"`
	StaffID       string    `csv:"staff_id,required" validate:"required,id"`
	MassKg        *float64  `csv:"mass,unit=mass" validate:"omitempty,gt=0,lte=200"`
	BodyCondition *int      `csv:"body_condition" validate:"omitempty,gte=1,lte=5"`
	Signs         []string  `csv:"signs" validate:"dive,oneof=wound lameness eye_lesion skin_lesion fur_loss fur_chewing tail_biting stereotypy diarrhoea nasal_discharge lethargy inappetence other"`
	VetInformed   Bool      `csv:"vet_informed"`
	Notes         string    `csv:"notes"`
}

// Treatment is a row of treatments.csv: one veterinary case.
type Treatment struct {
	Ref          Ref
	CaseID       string `csv:"case_id,required" validate:"required,id"`
	AnimalID     string `csv:"animal_id,required" validate:"required,id"`
	OpenedOn     Day    `csv:"opened_on,required" validate:"required"`
	Diagnosis    string `csv:"diagnosis,required" validate:"required"`
	PrescribedBy string `csv:"prescribed_by,required" validate:"required,id"`
	ReviewedOn   Day    `csv:"reviewed_on"` // latest review by a veterinarian
	ClosedOn     Day    `csv:"closed_on"`   // zero: open
	Outcome      string `csv:"outcome" validate:"omitempty,oneof=recovered chronic died culled transferred"`
}

// Litter is a row of litters.csv.
type Litter struct {
	Ref       Ref
	ID        string `csv:"litter_id,required" validate:"required,id"`
	DamID     string `csv:"dam_id,required" validate:"required,id"`
	WhelpedOn Day    `csv:"whelped_on,required" validate:"required"`
	Born      int    `csv:"born,required" validate:"gte=0,lte=100"`
	BornAlive *int   `csv:"born_alive" validate:"omitempty,gte=0,lte=100"`
	WeanedOn  Day    `csv:"weaned_on"`
	Weaned    *int   `csv:"weaned" validate:"omitempty,gte=0,lte=100"`
}
