package reports

import (
	"encoding/csv"
	"io"

	"welfare/checker"
)

// csvHeader is the findings.csv header; the column order is part of the contract.
var csvHeader = []string{"severity", "check", "domain", "subject", "on", "until", "message", "evidence", "title", "source", "report_to",
	"key", "problem", "class", "plan", "action_status"}

// ReportableMark is what every output says beside a reportable finding
// (PHS Policy IV.F.3: noncompliance reported through the institutional official).
const ReportableMark = "report to the institutional official"

// LocalMark follows the title of a check from the committee's own rules
// (a --rules folder) in every output.
const LocalMark = " (local rule)"

// WriteCSV writes one finding per row, in r.Findings order, evidence refs
// joined with "; ". A cell a spreadsheet would run as a formula is neutralised
// (see Neutralise).
func WriteCSV(w io.Writer, r *checker.Result) error {
	cw := csv.NewWriter(w)
	if err := cw.Write(csvHeader); err != nil {
		return err
	}
	row := make([]string, len(csvHeader))
	for i := range r.Findings {
		f := &r.Findings[i]
		until := ""
		if f.Until != f.On {
			until = f.Until.String()
		}
		row[0] = string(f.Severity)
		row[1] = f.Check
		row[2] = domainOf(f)
		row[3] = f.Subject
		row[4] = f.On.String()
		row[5] = until
		row[6] = f.Message
		row[7] = refsString(f.Evidence, "; ")
		row[8] = f.Title
		if f.Local {
			row[8] += LocalMark
		}
		row[9] = f.Source
		row[10] = ""
		if f.Reportable {
			row[10] = ReportableMark
		}
		row[11], row[12], row[13] = f.Key(), f.Problem(), r.ClassOf(f)
		row[14], row[15] = "", ""
		if a := r.ActionFor(f); a != nil {
			row[14], row[15] = a.Action.Plan, a.Status
		}
		for j := range row {
			row[j] = Neutralise(row[j])
		}
		if err := cw.Write(row); err != nil {
			return err
		}
	}
	cw.Flush()
	return cw.Error()
}
