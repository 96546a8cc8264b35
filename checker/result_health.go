package checker

import (
	"slices"
	"sort"

	"welfare/records"
)

// The report's figures beside the findings: the measurements the health,
// heat, environment and cleaning facts computed, gathered once the rules
// have judged them, so the report can draw what the rules saw. The
// judgement stays in the findings: a figure is marked (High, Unreviewed,
// Overdue, ...) only when a finding of its check says so.

// Health is the health-and-mortality figures of the period. It is nil when
// none of deaths.csv, observations.csv, treatments.csv and litters.csv was
// in the records folder.
type Health struct {
	// Files are those of the four health files the folder had.
	Files []string `json:"files"`
	// Deaths are the deaths.csv rows found dead in the period, by time.
	Deaths []DeathLine `json:"deaths"`
	// Mortality is per building and calendar month with at least one death
	// (the health facts' months), with the limit in force.
	Mortality      []MortalityMonth `json:"mortality"`
	MortalityLimit MortalityLimit   `json:"mortality_limit"`
	// OpenCases are the veterinary cases still open at the period's end.
	OpenCases []OpenCase `json:"open_cases"`
	// WeightLoss are the animals with health.weight.loss findings, with
	// their weighings from WeightLossDays before the period to its end.
	WeightLoss     []AnimalWeights `json:"weight_loss"`
	WeightLossPct  float64         `json:"weight_loss_pct"`
	WeightLossDays int             `json:"weight_loss_days"`
	// EarlyWeaning are the litters with litter.weaning.early findings.
	EarlyWeaning []WeanedLitter `json:"early_weaning"`
}

// DeathLine is one death found in the period.
type DeathLine struct {
	Animal   string      `json:"animal"`
	Species  string      `json:"species"`
	Building string      `json:"building"` // where it lived that day; "" when unknown
	On       records.Day `json:"on"`
	Cause    string      `json:"cause"` // suspected cause; "unknown" when not recorded
	Necropsy bool        `json:"necropsy"`
	Ref      records.Ref `json:"ref"`
}

// MortalityMonth is one building's deaths in one calendar month against its
// animal-days; High is set when a health.mortality.high finding names it.
type MortalityMonth struct {
	Building    string      `json:"building"`
	Month       records.Day `json:"month"` // its first day
	Deaths      int         `json:"deaths"`
	AnimalDays  int         `json:"animal_days"`
	DaysInMonth int         `json:"days_in_month"`
	High        bool        `json:"high"`
}

// MortalityLimit is health.mortality in the limits in force.
type MortalityLimit struct {
	MinDeaths  int     `json:"min_deaths"`
	MonthlyPct float64 `json:"monthly_pct"`
}

// OpenCase is a veterinary case open at the period's end. Unreviewed is set
// when a health.case.unreviewed finding names its animal.
type OpenCase struct {
	Case       string      `json:"case"`
	Animal     string      `json:"animal"`
	Diagnosis  string      `json:"diagnosis"`
	Opened     records.Day `json:"opened"`
	Reviewed   records.Day `json:"reviewed"` // zero: no review recorded
	Unreviewed bool        `json:"unreviewed"`
	Ref        records.Ref `json:"ref"`
}

// AnimalWeights is one animal's weighings and the days of its weight-loss
// findings.
type AnimalWeights struct {
	Animal    string        `json:"animal"`
	Species   string        `json:"species"`
	Weighings []Weighing    `json:"weighings"`
	Findings  []records.Day `json:"findings"`
}

// Weighing is one mass (kg) on one day.
type Weighing struct {
	Day records.Day `json:"day"`
	Kg  float64     `json:"kg"`
}

// WeanedLitter is a litter weaned in the period with an early-weaning finding.
type WeanedLitter struct {
	Litter   string      `json:"litter"`
	Dam      string      `json:"dam"`
	Species  string      `json:"species"`
	Whelped  records.Day `json:"whelped"`
	WeanedOn records.Day `json:"weaned_on"`
	AgeDays  int         `json:"age_days"`
	MinDays  int         `json:"min_days"` // litter.min_weaning_days for the species; 0 when not set
	Born     int         `json:"born"`
	Weaned   *int        `json:"weaned,omitempty"`
}

// addFigures fills the result's report figures from the facts, after the
// findings are known. A run limited to other domains (--only) gets none:
// the figures are marked by findings it did not keep.
func (f *facts) addFigures(res *Result, only []string, gaps []CleaningGap) {
	in := func(domains ...string) bool {
		if len(only) == 0 {
			return true
		}
		for _, d := range domains {
			if slices.Contains(only, d) {
				return true
			}
		}
		return false
	}
	if in("health", "litter") {
		res.Health = f.healthFigures(res.Findings)
	}
	if in("heat", "environment", "care") {
		res.Warm = f.warmFigures(res.Findings, gaps)
	}
}

// findingDays lists, per subject, the days of one check's findings.
func findingDays(fs []Finding, check string) map[string][]records.Day {
	out := map[string][]records.Day{}
	for i := range fs {
		if fs[i].Check == check {
			out[fs[i].Subject] = append(out[fs[i].Subject], fs[i].On)
		}
	}
	return out
}

func (f *facts) healthFigures(fs []Finding) *Health {
	h := &Health{
		Deaths: []DeathLine{}, Mortality: []MortalityMonth{}, OpenCases: []OpenCase{},
		WeightLoss: []AnimalWeights{}, EarlyWeaning: []WeanedLitter{},
		MortalityLimit: MortalityLimit{MinDeaths: f.lim.Health.Mortality.MinDeaths, MonthlyPct: f.lim.Health.Mortality.MonthlyPct},
		WeightLossPct:  f.lim.Health.WeightLossPct, WeightLossDays: f.lim.Health.WeightLossDays,
	}
	for _, file := range []string{"deaths.csv", "observations.csv", "treatments.csv", "litters.csv"} {
		if f.set.Present[file] {
			h.Files = append(h.Files, file)
		}
	}
	if len(h.Files) == 0 {
		return nil
	}

	for i := range f.set.Deaths {
		d := &f.set.Deaths[i]
		a := f.animals[d.AnimalID]
		day := records.DayOf(d.FoundDeadAt)
		if a == nil || !f.inPeriod(day) {
			continue
		}
		cause := d.SuspectedCause
		if cause == "" {
			cause = "unknown"
		}
		h.Deaths = append(h.Deaths, DeathLine{Animal: a.ID, Species: a.Species, Building: f.buildingOn(a, day),
			On: day, Cause: cause, Necropsy: d.Necropsy.IsYes(), Ref: d.Ref})
	}
	sort.SliceStable(h.Deaths, func(i, j int) bool {
		if h.Deaths[i].On != h.Deaths[j].On {
			return h.Deaths[i].On < h.Deaths[j].On
		}
		return h.Deaths[i].Animal < h.Deaths[j].Animal
	})

	high := findingDays(fs, "health.mortality.high")
	ms, _ := section(f.doc("facility", f.set.Facility.Name), "mortality").([]any)
	for _, x := range ms {
		m := x.(map[string]any)
		month, _ := records.ParseDay(m["on"].(string))
		mm := MortalityMonth{Building: m["building"].(string), Month: month, Deaths: m["deaths"].(int),
			AnimalDays: m["animal_days"].(int), DaysInMonth: m["days_in_month"].(int)}
		for _, d := range high[mm.Building] {
			mm.High = mm.High || monthStart(d) == month
		}
		h.Mortality = append(h.Mortality, mm)
	}

	unreviewed := findingDays(fs, "health.case.unreviewed")
	for i := range f.set.Treatments {
		t := &f.set.Treatments[i]
		if f.animals[t.AnimalID] == nil || t.OpenedOn > f.period.To || (!t.ClosedOn.IsZero() && t.ClosedOn <= f.period.To) {
			continue
		}
		h.OpenCases = append(h.OpenCases, OpenCase{Case: t.CaseID, Animal: t.AnimalID, Diagnosis: t.Diagnosis,
			Opened: t.OpenedOn, Reviewed: t.ReviewedOn, Unreviewed: len(unreviewed[t.AnimalID]) > 0, Ref: t.Ref})
	}
	sort.SliceStable(h.OpenCases, func(i, j int) bool {
		if h.OpenCases[i].Opened != h.OpenCases[j].Opened {
			return h.OpenCases[i].Opened < h.OpenCases[j].Opened
		}
		return h.OpenCases[i].Case < h.OpenCases[j].Case
	})

	lost := findingDays(fs, "health.weight.loss")
	ids := make([]string, 0, len(lost))
	for id := range lost {
		ids = append(ids, id)
	}
	sort.Strings(ids)
	since := f.period.From - records.Day(f.lim.Health.WeightLossDays)
	for _, id := range ids {
		a := f.animals[id]
		if a == nil {
			continue
		}
		aw := AnimalWeights{Animal: id, Species: a.Species, Weighings: []Weighing{}, Findings: lost[id]}
		ws, _ := section(f.animalDoc(a), "weights").([]any)
		for _, x := range ws {
			w := x.(map[string]any)
			if d := records.Day(w["day"].(int)); d >= since {
				aw.Weighings = append(aw.Weighings, Weighing{Day: d, Kg: w["kg"].(float64)})
			}
		}
		h.WeightLoss = append(h.WeightLoss, aw)
	}

	early := findingDays(fs, "litter.weaning.early")
	for i := range f.set.Litters {
		l := &f.set.Litters[i]
		a := f.animals[l.DamID]
		if a == nil || len(early[l.ID]) == 0 {
			continue
		}
		h.EarlyWeaning = append(h.EarlyWeaning, WeanedLitter{Litter: l.ID, Dam: a.ID, Species: a.Species,
			Whelped: l.WhelpedOn, WeanedOn: l.WeanedOn, AgeDays: int(l.WeanedOn - l.WhelpedOn),
			MinDays: f.lim.Litter.MinWeaningDays[a.Species], Born: l.Born, Weaned: l.Weaned})
	}
	return h
}
