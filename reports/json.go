package reports

import (
	"bufio"
	"bytes"
	"encoding/json"
	"fmt"
	"io"

	"welfare/checker"
	"welfare/records"
)

// The JSON document is its own set of types rather than checker.Result (or
// any checker or records type) marshalled directly: the file is a published
// contract, and a field added to a checker type for its own convenience must
// not change it by accident. These types are the whole format; the golden
// files under testdata/golden hold it still.

// JSONReport is findings.json: one object per check run.
type JSONReport struct {
	Facility    string     `json:"facility"`
	Period      JSONPeriod `json:"period"`
	Fingerprint string     `json:"fingerprint"` // SHA-256 over the records, rules and limits used, and --only
	// Scope: --only, the checks switched off, the limits changed, the local rules.
	Scope        JSONScope          `json:"scope"`
	Accounting   []JSONFileCount    `json:"accounting"`
	Findings     []JSONFinding      `json:"findings"`
	Checks       []JSONCheck        `json:"checks"`
	NotEvaluated []JSONNotEvaluated `json:"not_evaluated"`
	// EvaluatedInPart lists the checks evaluated only in part: items they
	// could not judge for a missing value (records.value.missing).
	EvaluatedInPart []JSONPartial    `json:"evaluated_in_part"`
	Warnings        []JSONWarning    `json:"warnings"`
	CareCoverage    JSONCareCoverage `json:"care_coverage"`
	// Health is present when the records folder had deaths.csv,
	// observations.csv, treatments.csv or litters.csv.
	Health *JSONHealth `json:"health,omitempty"`
	// Warm is the warm-season, inside-building and cleaning figures;
	// present when the run covered the heat, environment or care domain.
	Warm *JSONWarm `json:"warm,omitempty"`
	// FollowUp is present when the run had a previous review or corrective actions.
	FollowUp *JSONFollowUp `json:"follow_up,omitempty"`
}

// JSONFollowUp is the follow-up of the previous review and the committee's
// corrective actions.
type JSONFollowUp struct {
	// Previous is the previous review's file and period; absent without --previous.
	Previous *JSONPrevious `json:"previous,omitempty"`
	// Resolved are the previous review's problems gone from checks evaluated
	// this time; NotRechecked those of checks not evaluated this time.
	Resolved          []JSONPastProblem `json:"resolved"`
	NotRechecked      []JSONPastProblem `json:"not_rechecked"`
	CorrectiveActions []JSONAction      `json:"corrective_actions"`
}

// JSONPrevious names the previous review.
type JSONPrevious struct {
	File     string     `json:"file"`
	Period   JSONPeriod `json:"period"`
	Findings int        `json:"findings"`
}

// JSONPastProblem is one problem of the previous review.
type JSONPastProblem struct {
	Problem  string `json:"problem"`
	Check    string `json:"check"`
	Domain   string `json:"domain"`
	Subject  string `json:"subject"`
	On       string `json:"on"` // its first finding's day in the previous review
	Severity string `json:"severity"`
	Findings int    `json:"findings"`
	Reason   string `json:"reason,omitempty"` // why it was not re-checked
}

// JSONAction is a corrective action and its status at the period's end.
type JSONAction struct {
	Ref        string `json:"ref"`
	Problem    string `json:"problem"`
	Check      string `json:"check"`
	Subject    string `json:"subject"`
	FoundOn    string `json:"found_on,omitempty"`
	Plan       string `json:"plan"`
	Owner      string `json:"owner,omitempty"`
	DueOn      string `json:"due_on"`
	ClosedOn   string `json:"closed_on,omitempty"`
	VerifiedBy string `json:"verified_by,omitempty"`
	Status     string `json:"status"` // on schedule, overdue, closed, verified
}

// JSONPeriod is the checked period, inclusive, as YYYY-MM-DD.
type JSONPeriod struct {
	From string `json:"from"`
	To   string `json:"to"`
}

// JSONFileCount is the row accounting of one record file: read = accepted +
// rejected; Failed says why a file was not used at all.
type JSONFileCount struct {
	File     string `json:"file"`
	Read     int    `json:"read"`
	Accepted int    `json:"accepted"`
	Rejected int    `json:"rejected"`
	Failed   string `json:"failed,omitempty"`
}

// JSONFinding is one finding; Until is present only for a run of days.
type JSONFinding struct {
	Severity string `json:"severity"`
	// SeverityWhy: why the severity differs from the check's default (absent when it does not).
	SeverityWhy string   `json:"severity_why,omitempty"`
	Check       string   `json:"check"`
	Domain      string   `json:"domain"`
	Subject     string   `json:"subject"`
	On          string   `json:"on"`
	Until       string   `json:"until,omitempty"`
	Message     string   `json:"message"`
	Evidence    []string `json:"evidence"`
	Title       string   `json:"title"`
	Source      string   `json:"source"`
	// Reportable findings are marked "report to the institutional official" (PHS Policy IV.F.3).
	Reportable bool   `json:"reportable,omitempty"`
	ReportTo   string `json:"report_to,omitempty"`
	// Key is check, subject and on; Problem is check and subject.
	Key     string `json:"key"`
	Problem string `json:"problem"`
	// Class is new or recurring against the previous review (absent without one).
	Class string `json:"class,omitempty"`
	// Action is the corrective action answering the finding, if any.
	Action *JSONFindingAction `json:"action,omitempty"`
	// Local is true for a finding of the committee's own rules.
	Local bool `json:"local,omitempty"`
}

// JSONFindingAction is the plan answering a finding and its status.
type JSONFindingAction struct {
	Plan   string `json:"plan"`
	Owner  string `json:"owner,omitempty"`
	DueOn  string `json:"due_on"`
	Status string `json:"status"`
}

// JSONCheck is one check in force, from its rule's METADATA.
type JSONCheck struct {
	ID          string   `json:"id"`
	Domain      string   `json:"domain"`
	Title       string   `json:"title"`
	Description string   `json:"description"`
	Severity    string   `json:"severity"` // the rule's default
	Source      string   `json:"source"`
	Package     string   `json:"package"`
	File        string   `json:"file"`
	Needs       []string `json:"needs,omitempty"`
	Runs        bool     `json:"runs,omitempty"`
	Subjects    []string `json:"subjects,omitempty"`
	// Escalation: when a finding's severity departs from the default.
	Escalation string `json:"escalation,omitempty"`
	// Period: "review" for a check judged over a review period, not day
	// by day (custom.period); absent for a daily check.
	Period string `json:"period,omitempty"`
	// Local: defined by a rule file not shipped with welfare.
	Local bool `json:"local,omitempty"`
}

// JSONNotEvaluated is a check that found no records to read, and why.
type JSONNotEvaluated struct {
	Check  string `json:"check"`
	Reason string `json:"reason"`
}

// JSONPartial is a check evaluated only in part: NotJudged of Total items
// (Unit) were not judged, counted by reason; Text is the line the summary prints.
type JSONPartial struct {
	Check     string       `json:"check"`
	NotJudged int          `json:"not_judged"`
	Total     int          `json:"total"`
	Unit      string       `json:"unit"`
	Why       []JSONReason `json:"why"`
	Text      string       `json:"text"`
}

// JSONReason is one reason items were not judged, and how many.
type JSONReason struct {
	Reason string `json:"reason"`
	Count  int    `json:"count"`
}

// JSONWarning is something read but not used (an unknown column, say).
type JSONWarning struct {
	File    string `json:"file"`
	Column  string `json:"column,omitempty"`
	Message string `json:"message"`
}

// JSONCareCoverage counts occupied enclosure-days and those with complete
// care records.
type JSONCareCoverage struct {
	OccupiedDays int `json:"occupied_enclosure_days"`
	CompleteDays int `json:"complete_days"`
}

// JSONHealth is the health-and-mortality figures the PDF's section draws:
// the measurements beside the findings (the findings judge them).
type JSONHealth struct {
	// Files are those of deaths.csv, observations.csv, treatments.csv and
	// litters.csv the folder had.
	Files []string `json:"files"`
	// Deaths found in the period, by day.
	Deaths []JSONDeath `json:"deaths"`
	// Mortality per building and calendar month with at least one death;
	// mortality_pct = deaths × 100 / mean_population, mean_population =
	// animal_days / days_in_month; high when a health.mortality.high
	// finding names the month.
	Mortality      []JSONMortality    `json:"mortality"`
	MortalityLimit JSONMortalityLimit `json:"mortality_limit"`
	// OpenCases are the veterinary cases still open at the period's end.
	OpenCases []JSONOpenCase `json:"open_cases"`
	// WeightLoss: every animal with a health.weight.loss finding, its
	// weighings from weight_loss_days before the period, and the days of
	// its findings.
	WeightLoss     []JSONAnimalWeights `json:"weight_loss"`
	WeightLossPct  float64             `json:"weight_loss_pct"`
	WeightLossDays int                 `json:"weight_loss_days"`
	// EarlyWeaning: the litters with a litter.weaning.early finding.
	EarlyWeaning []JSONWeanedLitter `json:"early_weaning"`
}

// JSONWarm is the warm-season, inside-building and cleaning figures the
// PDF's section draws: the measurements beside the findings (the heat,
// environment and care.cleaning findings judge them). Temperatures are °C.
type JSONWarm struct {
	// HotDayC is heat.hot_day_c in the limits in force.
	HotDayC float64 `json:"hot_day_c"`
	// Sites are the weather sites with a day in the period whose maximum
	// air temperature or heat index reached hot_day_c, each with every day
	// it has readings of; [] in a cold period.
	Sites []JSONSiteHeat `json:"sites"`
	// EnvironmentRecorded: environment.csv was in the records folder.
	EnvironmentRecorded bool `json:"environment_recorded"`
	// Buildings are the indoor and sheltered buildings with readings on
	// days they housed animals, against each housed species' indoor_temp_c.
	Buildings []JSONBuildingClimate `json:"buildings"`
	// CleaningRecorded: daily_care.csv was in the records folder;
	// CleanEveryDays is care.clean_every_days in the limits in force.
	CleaningRecorded bool `json:"cleaning_recorded"`
	CleanEveryDays   int  `json:"clean_every_days"`
	// Cleaning are the longest gaps between cleanings (checker.MaxCleaningGaps, six, longest
	// first) and every gap with a care.cleaning.overdue finding (overdue).
	Cleaning []JSONCleaningGap `json:"cleaning"`
}

// JSONSiteHeat is one weather site's days.
type JSONSiteHeat struct {
	Site string        `json:"site"`
	Days []JSONDayHeat `json:"days"`
}

// JSONDayHeat is one day at a site: the highest air temperature and the
// highest NWS heat index of its readings.
type JSONDayHeat struct {
	On            string  `json:"on"`
	MaxAirC       float64 `json:"max_air_c"`
	MaxHeatIndexC float64 `json:"max_heat_index_c"`
	Readings      int     `json:"readings"`
}

// JSONBuildingClimate is one building's indoor air per day; exposure is
// indoor or sheltered.
type JSONBuildingClimate struct {
	Building string             `json:"building"`
	Exposure string             `json:"exposure"`
	Ranges   []JSONSpeciesRange `json:"ranges"`
	Days     []JSONDayRange     `json:"days"`
}

// JSONSpeciesRange is a species' indoor_temp_c range from the limits.
type JSONSpeciesRange struct {
	Species string  `json:"species"`
	MinC    float64 `json:"min_c"`
	MaxC    float64 `json:"max_c"`
}

// JSONDayRange is the lowest and highest reading of one day.
type JSONDayRange struct {
	On       string  `json:"on"`
	MinC     float64 `json:"min_c"`
	MaxC     float64 `json:"max_c"`
	Readings int     `json:"readings"`
}

// JSONCleaningGap is one enclosure's days between cleanings, from one
// cleaning (or the start) until the next (or the period's end).
type JSONCleaningGap struct {
	Enclosure string `json:"enclosure"`
	From      string `json:"from"`
	Until     string `json:"until"`
	Days      int    `json:"days"`
	Overdue   bool   `json:"overdue"`
}

// JSONDeath is one death; cause is "unknown" when none was recorded.
type JSONDeath struct {
	Animal   string `json:"animal"`
	Species  string `json:"species"`
	Building string `json:"building"` // "" when unknown
	On       string `json:"on"`
	Cause    string `json:"cause"`
	Necropsy bool   `json:"necropsy"`
	Evidence string `json:"evidence"`
}

// JSONMortality is one building's deaths in one month (YYYY-MM).
type JSONMortality struct {
	Building       string  `json:"building"`
	Month          string  `json:"month"`
	Deaths         int     `json:"deaths"`
	AnimalDays     int     `json:"animal_days"`
	DaysInMonth    int     `json:"days_in_month"`
	MeanPopulation float64 `json:"mean_population"`
	MortalityPct   float64 `json:"mortality_pct"`
	High           bool    `json:"high"`
}

// JSONMortalityLimit is health.mortality in the limits in force.
type JSONMortalityLimit struct {
	MinDeaths  int     `json:"min_deaths"`
	MonthlyPct float64 `json:"monthly_pct"`
}

// JSONOpenCase is a veterinary case open at the period's end; reviewed_on
// is "" when no review was recorded; unreviewed when a
// health.case.unreviewed finding names its animal.
type JSONOpenCase struct {
	Case       string `json:"case"`
	Animal     string `json:"animal"`
	Diagnosis  string `json:"diagnosis"`
	OpenedOn   string `json:"opened_on"`
	ReviewedOn string `json:"reviewed_on"`
	Unreviewed bool   `json:"unreviewed"`
	Evidence   string `json:"evidence"`
}

// JSONAnimalWeights is one animal's weighings (kg) and finding days.
type JSONAnimalWeights struct {
	Animal      string         `json:"animal"`
	Species     string         `json:"species"`
	Weighings   []JSONWeighing `json:"weighings"`
	FindingDays []string       `json:"finding_days"`
}

// JSONWeighing is one mass on one day.
type JSONWeighing struct {
	On string  `json:"on"`
	Kg float64 `json:"kg"`
}

// JSONWeanedLitter is a litter weaned early; min_days is 0 when the
// species has no minimum in the limits, weaned null when not recorded.
type JSONWeanedLitter struct {
	Litter   string `json:"litter"`
	Dam      string `json:"dam"`
	Species  string `json:"species"`
	Whelped  string `json:"whelped_on"`
	WeanedOn string `json:"weaned_on"`
	AgeDays  int    `json:"age_days"`
	MinDays  int    `json:"min_days"`
	Born     int    `json:"born"`
	Weaned   *int   `json:"weaned"`
}

func newJSONHealth(h *checker.Health) *JSONHealth {
	if h == nil {
		return nil
	}
	out := &JSONHealth{Files: append([]string{}, h.Files...),
		Deaths: []JSONDeath{}, Mortality: []JSONMortality{}, OpenCases: []JSONOpenCase{},
		WeightLoss: []JSONAnimalWeights{}, EarlyWeaning: []JSONWeanedLitter{},
		MortalityLimit: JSONMortalityLimit{MinDeaths: h.MortalityLimit.MinDeaths, MonthlyPct: h.MortalityLimit.MonthlyPct},
		WeightLossPct:  h.WeightLossPct, WeightLossDays: h.WeightLossDays}
	for _, d := range h.Deaths {
		out.Deaths = append(out.Deaths, JSONDeath{Animal: d.Animal, Species: d.Species, Building: d.Building, On: d.On.String(),
			Cause: d.Cause, Necropsy: d.Necropsy, Evidence: string(d.Ref)})
	}
	for _, m := range h.Mortality {
		jm := JSONMortality{Building: m.Building, Month: m.Month.String()[:7], Deaths: m.Deaths, AnimalDays: m.AnimalDays,
			DaysInMonth: m.DaysInMonth, High: m.High}
		if m.DaysInMonth > 0 && m.AnimalDays > 0 {
			jm.MeanPopulation = float64(m.AnimalDays) / float64(m.DaysInMonth)
			jm.MortalityPct = float64(m.Deaths) * 100 / jm.MeanPopulation
		}
		out.Mortality = append(out.Mortality, jm)
	}
	for _, c := range h.OpenCases {
		rev := ""
		if !c.Reviewed.IsZero() {
			rev = c.Reviewed.String()
		}
		out.OpenCases = append(out.OpenCases, JSONOpenCase{Case: c.Case, Animal: c.Animal, Diagnosis: c.Diagnosis,
			OpenedOn: c.Opened.String(), ReviewedOn: rev, Unreviewed: c.Unreviewed, Evidence: string(c.Ref)})
	}
	for _, a := range h.WeightLoss {
		ja := JSONAnimalWeights{Animal: a.Animal, Species: a.Species, Weighings: []JSONWeighing{}, FindingDays: []string{}}
		for _, w := range a.Weighings {
			ja.Weighings = append(ja.Weighings, JSONWeighing{On: w.Day.String(), Kg: w.Kg})
		}
		for _, d := range a.Findings {
			ja.FindingDays = append(ja.FindingDays, d.String())
		}
		out.WeightLoss = append(out.WeightLoss, ja)
	}
	for _, l := range h.EarlyWeaning {
		out.EarlyWeaning = append(out.EarlyWeaning, JSONWeanedLitter{Litter: l.Litter, Dam: l.Dam, Species: l.Species,
			Whelped: l.Whelped.String(), WeanedOn: l.WeanedOn.String(), AgeDays: l.AgeDays, MinDays: l.MinDays,
			Born: l.Born, Weaned: l.Weaned})
	}
	return out
}

func newJSONWarm(w *checker.Warm) *JSONWarm {
	if w == nil {
		return nil
	}
	out := &JSONWarm{HotDayC: w.HotDayC, Sites: []JSONSiteHeat{}, EnvironmentRecorded: w.EnvironmentRecorded,
		Buildings: []JSONBuildingClimate{}, CleaningRecorded: w.CleaningRecorded, CleanEveryDays: w.CleanEveryDays,
		Cleaning: []JSONCleaningGap{}}
	for _, s := range w.Sites {
		js := JSONSiteHeat{Site: s.Site, Days: []JSONDayHeat{}}
		for _, d := range s.Days {
			js.Days = append(js.Days, JSONDayHeat{On: d.Day.String(), MaxAirC: d.MaxAirC, MaxHeatIndexC: d.MaxHeatIndexC, Readings: d.Readings})
		}
		out.Sites = append(out.Sites, js)
	}
	for _, b := range w.Buildings {
		jb := JSONBuildingClimate{Building: b.Building, Exposure: b.Exposure, Ranges: []JSONSpeciesRange{}, Days: []JSONDayRange{}}
		for _, r := range b.Ranges {
			jb.Ranges = append(jb.Ranges, JSONSpeciesRange{Species: r.Species, MinC: r.MinC, MaxC: r.MaxC})
		}
		for _, d := range b.Days {
			jb.Days = append(jb.Days, JSONDayRange{On: d.Day.String(), MinC: d.MinC, MaxC: d.MaxC, Readings: d.Readings})
		}
		out.Buildings = append(out.Buildings, jb)
	}
	for _, g := range w.Cleaning {
		out.Cleaning = append(out.Cleaning, JSONCleaningGap{Enclosure: g.Enclosure, From: g.From.String(), Until: g.Until.String(),
			Days: g.Days, Overdue: g.Overdue})
	}
	return out
}

// NewJSONReport converts r to the published format. Lists are [] rather
// than null when empty, so a reader never has to tell the two apart.
func NewJSONReport(r *checker.Result) JSONReport {
	doc := JSONReport{
		Facility:        r.Facility,
		Period:          JSONPeriod{From: r.Period.From.String(), To: r.Period.To.String()},
		Fingerprint:     r.Fingerprint,
		Scope:           newJSONScope(r.Scope),
		Accounting:      make([]JSONFileCount, len(r.Accounting)),
		Findings:        make([]JSONFinding, len(r.Findings)),
		Checks:          make([]JSONCheck, len(r.Checks)),
		NotEvaluated:    make([]JSONNotEvaluated, len(r.NotEvaluated)),
		EvaluatedInPart: make([]JSONPartial, len(r.Partial)),
		Warnings:        make([]JSONWarning, len(r.Warnings)),
		CareCoverage:    JSONCareCoverage{OccupiedDays: r.Care.OccupiedDays, CompleteDays: r.Care.CompleteDays},
		Health:          newJSONHealth(r.Health),
		Warm:            newJSONWarm(r.Warm),
	}
	for i, c := range r.Accounting {
		doc.Accounting[i] = JSONFileCount{File: c.File, Read: c.Read, Accepted: c.Accepted, Rejected: c.Rejected, Failed: c.Failed}
	}
	for i := range r.Findings {
		f := &r.Findings[i]
		jf := JSONFinding{
			Severity:    string(f.Severity),
			SeverityWhy: f.SeverityWhy,
			Check:       f.Check,
			Domain:      domainOf(f),
			Subject:     f.Subject,
			On:          f.On.String(),
			Message:     f.Message,
			Evidence:    make([]string, len(f.Evidence)),
			Title:       f.Title,
			Source:      f.Source,
			Key:         f.Key(),
			Problem:     f.Problem(),
			Class:       r.ClassOf(f),
			Local:       f.Local,
		}
		if a := r.ActionFor(f); a != nil {
			jf.Action = &JSONFindingAction{Plan: a.Action.Plan, Owner: a.Action.Owner, DueOn: a.Action.DueOn.String(), Status: a.Status}
		}
		if f.Reportable {
			jf.Reportable, jf.ReportTo = true, ReportableMark
		}
		if f.Until != f.On {
			jf.Until = f.Until.String()
		}
		for j, e := range f.Evidence {
			jf.Evidence[j] = string(e)
		}
		doc.Findings[i] = jf
	}
	for i, c := range r.Checks {
		doc.Checks[i] = JSONCheck{ID: c.ID, Domain: c.Domain, Title: c.Title, Description: c.Description,
			Severity: string(c.Severity), Source: c.Source, Package: c.Package, File: c.File,
			Needs: c.Needs, Runs: c.Runs, Subjects: c.Subjects, Escalation: c.Escalation, Period: c.Period, Local: c.Local}
	}
	for i, s := range r.NotEvaluated {
		doc.NotEvaluated[i] = JSONNotEvaluated{Check: s.Check, Reason: s.Reason}
	}
	for i, p := range r.Partial {
		jp := JSONPartial{Check: p.Check, NotJudged: p.NotJudged, Total: p.Total, Unit: p.Unit,
			Why: make([]JSONReason, len(p.Why)), Text: p.String()}
		for j, w := range p.Why {
			jp.Why[j] = JSONReason{Reason: w.Reason, Count: w.Count}
		}
		doc.EvaluatedInPart[i] = jp
	}
	for i, w := range r.Warnings {
		doc.Warnings[i] = JSONWarning{File: w.File, Column: w.Column, Message: w.Message}
	}
	doc.FollowUp = jsonFollowUp(r.FollowUp)
	return doc
}

func jsonFollowUp(fu *checker.FollowUp) *JSONFollowUp {
	if fu == nil || (fu.Previous == nil && len(fu.Actions) == 0) {
		return nil
	}
	out := &JSONFollowUp{Resolved: jsonPast(fu.Resolved), NotRechecked: jsonPast(fu.NotRechecked), CorrectiveActions: []JSONAction{}}
	if p := fu.Previous; p != nil {
		out.Previous = &JSONPrevious{File: p.File, Period: JSONPeriod{From: p.Period.From.String(), To: p.Period.To.String()}, Findings: len(p.Findings)}
	}
	day := func(d records.Day) string {
		if d.IsZero() {
			return ""
		}
		return d.String()
	}
	for _, a := range fu.Actions {
		c := a.Action
		out.CorrectiveActions = append(out.CorrectiveActions, JSONAction{Ref: string(c.Ref), Problem: a.Problem(), Check: c.Check,
			Subject: c.Subject, FoundOn: day(c.FoundOn), Plan: c.Plan, Owner: c.Owner, DueOn: c.DueOn.String(),
			ClosedOn: day(c.ClosedOn), VerifiedBy: c.VerifiedBy, Status: a.Status})
	}
	return out
}

func jsonPast(ps []checker.PastProblem) []JSONPastProblem {
	out := make([]JSONPastProblem, 0, len(ps))
	for _, p := range ps {
		out = append(out, JSONPastProblem{Problem: p.Problem(), Check: p.Check, Domain: p.Domain, Subject: p.Subject,
			On: p.On.String(), Severity: string(p.Severity), Findings: p.Count, Reason: p.Why})
	}
	return out
}

// WriteJSON writes r as one JSON object (indented by two spaces): facility,
// period, fingerprint, accounting, findings, checks, not_evaluated, warnings
// care_coverage and, when health records were read, health (see JSONReport). Dates are YYYY-MM-DD.
//
// The findings are written one at a time, each indented as in the whole
// document, so a run with hundreds of thousands of findings is not held
// twice more in memory (marshalled, then indented) on its way out.
func WriteJSON(w io.Writer, r *checker.Result) error {
	doc := NewJSONReport(r)
	findings := doc.Findings
	doc.Findings = nil // written as null, then replaced by the streamed array
	var head bytes.Buffer
	if err := encodeJSON(&head, doc, ""); err != nil {
		return err
	}
	const hole = "\n  \"findings\": null"
	at := bytes.Index(head.Bytes(), []byte(hole))
	if at < 0 {
		return fmt.Errorf("reports: findings.json: no place for the findings in the document")
	}
	at += len(hole) - len("null")
	bw := bufio.NewWriterSize(w, 1<<16)
	bw.Write(head.Bytes()[:at])
	if len(findings) == 0 {
		bw.WriteString("[]")
	} else {
		bw.WriteString("[\n")
		var one []byte
		for i := range findings {
			one = appendFinding(append(one[:0], "    "...), &findings[i])
			bw.Write(one)
			if i < len(findings)-1 {
				bw.WriteByte(',')
			}
			bw.WriteByte('\n')
		}
		bw.WriteString("  ]")
	}
	bw.Write(head.Bytes()[at+len("null"):])
	return bw.Flush()
}

// encodeJSON writes v indented by two spaces under prefix, HTML left as it
// is: messages quote limits such as "≤ −20 °C"; keep them readable.
func encodeJSON(w io.Writer, v any, prefix string) error {
	enc := json.NewEncoder(w)
	enc.SetIndent(prefix, "  ")
	enc.SetEscapeHTML(false)
	return enc.Encode(v)
}
