// Package reports writes a checker.Result for people and programs: a plain
// terminal summary (WriteText), the keepers' view of one day so far (WriteToday),
// the machine-readable findings (WriteJSON, WriteCSV) and the content of the
// PDF audit report a veterinarian signs (BuildAudit).
//
// How the package fits:
//
//   - summary.go: counting and grouping findings, shared by every output.
//   - text.go, today.go (and morning.go's cautions): the terminal screens.
//   - json.go: the published JSON format (JSONReport and its parts) and its
//     writer; no checker or records type is marshalled directly.
//   - csv.go, neutralise.go: findings.csv, with every cell a spreadsheet
//     would run as a formula neutralised.
//   - audit.go, auditbuild.go, auditcold.go: the PDF as a section model
//     (Audit: sections, headings, tables with rows, charts with their
//     series, captions), built without any PDF library.
//   - pdf (reports/pdf): draws an Audit with gofpdf, the only package that
//     imports it; pdf.Write(w, result, options) is the whole PDF.
//
// Every writer is deterministic: the same Result (and, for the PDF, the same
// PDFOptions) gives the same bytes, so a report can be reproduced from the
// records years later and checked against its fingerprint. The golden files
// under testdata/golden hold every output still (see DEVELOPERS.md).
//
// Every human-readable output says that it is a records check, not a
// veterinary judgement, and defers to the attending veterinarian, the
// animal-care committee and local law.
package reports
