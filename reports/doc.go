// Package reports writes a checker.Result for people and programs: a plain
// terminal summary (WriteText), the machine-readable findings (WriteJSON,
// WriteCSV) and the PDF audit report a veterinarian signs (WritePDF).
//
// Every writer takes an io.Writer and is deterministic: the same Result (and,
// for the PDF, the same PDFOptions) gives the same bytes, so a report can be
// reproduced from the records years later and checked against its
// fingerprint.
//
// Every human-readable output says that it is a records check, not a
// veterinary judgement, and defers to the attending veterinarian, the
// animal-care committee and local law.
package reports
