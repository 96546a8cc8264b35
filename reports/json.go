package reports

import (
	"encoding/json"
	"io"

	"welfare/checker"
	"welfare/records"
)

// The JSON document is its own set of types rather than checker.Result
// marshalled directly: the file is a published contract, and a field added to
// Result for the checker's convenience must not change it by accident.
type jsonReport struct {
	Facility     string               `json:"facility"`
	Period       jsonPeriod           `json:"period"`
	Fingerprint  string               `json:"fingerprint"`
	Accounting   []records.FileCount  `json:"accounting"`
	Findings     []jsonFinding        `json:"findings"`
	Checks       []checker.CheckInfo  `json:"checks"`
	NotEvaluated []checker.Skipped    `json:"not_evaluated"`
	Warnings     []records.Warning    `json:"warnings"`
	CareCoverage checker.CareCoverage `json:"care_coverage"`
}

type jsonPeriod struct {
	From string `json:"from"`
	To   string `json:"to"`
}

type jsonFinding struct {
	Severity checker.Severity `json:"severity"`
	Check    string           `json:"check"`
	Domain   string           `json:"domain"`
	Subject  string           `json:"subject"`
	On       string           `json:"on"`
	Until    string           `json:"until,omitempty"`
	Message  string           `json:"message"`
	Evidence []string         `json:"evidence"`
	Title    string           `json:"title"`
	Source   string           `json:"source"`
	// Reportable findings are marked "report to the institutional official" (PHS Policy IV.F.3).
	Reportable bool   `json:"reportable,omitempty"`
	ReportTo   string `json:"report_to,omitempty"`
}

// WriteJSON writes r as one JSON object (indented by two spaces): facility,
// period, fingerprint, accounting, findings, checks, not_evaluated, warnings
// and care_coverage. Dates are YYYY-MM-DD; lists are [] rather than null
// when empty, so a reader never has to tell the two apart.
func WriteJSON(w io.Writer, r *checker.Result) error {
	doc := jsonReport{
		Facility:     r.Facility,
		Period:       jsonPeriod{From: r.Period.From.String(), To: r.Period.To.String()},
		Fingerprint:  r.Fingerprint,
		Accounting:   nonNil(r.Accounting),
		Findings:     make([]jsonFinding, len(r.Findings)),
		Checks:       nonNil(r.Checks),
		NotEvaluated: nonNil(r.NotEvaluated),
		Warnings:     nonNil(r.Warnings),
		CareCoverage: r.Care,
	}
	for i := range r.Findings {
		f := &r.Findings[i]
		jf := jsonFinding{
			Severity: f.Severity,
			Check:    f.Check,
			Domain:   domainOf(f),
			Subject:  f.Subject,
			On:       f.On.String(),
			Message:  f.Message,
			Evidence: make([]string, len(f.Evidence)),
			Title:    f.Title,
			Source:   f.Source,
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
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	// Messages quote limits such as "≤ −20 °C"; keep them readable.
	enc.SetEscapeHTML(false)
	return enc.Encode(doc)
}

func nonNil[T any](s []T) []T {
	if s == nil {
		return []T{}
	}
	return s
}
