package checker

import (
	"errors"
	"fmt"
	"slices"
	"strings"
	"welfare/records"
)

var findingKeys = map[string]bool{
	"check": true, "subject": true, "on": true, "until": true,
	"message": true, "evidence": true, "severity": true, "severity_reason": true,
}

// toFinding converts one object of a findings set. keep is false when the
// limits turn the check off. lines (file -> its number of lines), when not
// nil, are the record files read: every evidence ref must name a line of
// one of them. An error names the offending field.
func (e *engine) toFinding(pkg string, raw any, lines map[string]int) (f Finding, keep bool, err error) {
	obj, ok := raw.(map[string]any)
	if !ok {
		return f, false, errors.New("it is not an object")
	}
	for k := range obj {
		if !findingKeys[k] {
			return f, false, fmt.Errorf("unknown field %q (fields: check, subject, on, until, message, evidence, severity, severity_reason)", k)
		}
	}
	bad := func(key, format string, args ...any) error {
		return fmt.Errorf("field %q: %s", key, fmt.Sprintf(format, args...))
	}
	str := func(key string, required bool) (string, error) {
		v, has := obj[key]
		if !has {
			if required {
				return "", bad(key, "missing")
			}
			return "", nil
		}
		s, ok := v.(string)
		if !ok || (required && s == "") {
			return "", bad(key, "must be a non-empty string, not %s", shorten(compactJSON(v), 60))
		}
		return s, nil
	}
	var check, on, until, sev string
	if check, err = str("check", true); err != nil {
		return f, false, err
	}
	info, ok := e.checks[check]
	if !ok {
		return f, false, bad("check", "%q has no METADATA (title, description, custom.id, custom.severity, custom.source)", check)
	}
	if info.Package != pkg {
		return f, false, bad("check", "%q belongs to package %s, not %s", check, info.Package, pkg)
	}
	f.Check, f.Domain, f.Title, f.Source, f.Local = check, info.Domain, info.Title, info.Source, info.Local
	f.Reportable = info.Reportable
	if f.Subject, err = str("subject", true); err != nil {
		return f, false, err
	}
	if f.Message, err = str("message", true); err != nil {
		return f, false, err
	}
	if on, err = str("on", true); err != nil {
		return f, false, err
	}
	if f.On, err = records.ParseDay(on); err != nil {
		return f, false, bad("on", "%v", err)
	}
	if until, err = str("until", false); err != nil {
		return f, false, err
	}
	if until != "" {
		if f.Until, err = records.ParseDay(until); err != nil {
			return f, false, bad("until", "%v", err)
		}
		if f.Until < f.On {
			return f, false, bad("until", "%s is before on %s", until, on)
		}
		if f.Until == f.On {
			f.Until = 0
		}
	}
	ev, has := obj["evidence"]
	if !has {
		return f, false, bad("evidence", `missing (a list of "FILE:LINE", may be empty)`)
	}
	refs, ok := ev.([]any)
	if !ok {
		return f, false, bad("evidence", `must be a list of "FILE:LINE" strings`)
	}
	for _, r := range refs {
		s, ok := r.(string)
		if !ok || s == "" {
			return f, false, bad("evidence", `must be a list of "FILE:LINE" strings, not one holding %s`, shorten(compactJSON(r), 60))
		}
		if lines != nil {
			if why := refNamesNoRow(s, lines); why != "" {
				return f, false, bad("evidence", "%q names no record row: %s", shorten(s, 80), why)
			}
		}
		f.Evidence = append(f.Evidence, records.Ref(s))
	}
	f.Evidence = sortRefs(f.Evidence)

	// Severity precedence: limits override > the finding's own > metadata.
	f.Severity = info.Severity
	if sev, err = str("severity", false); err != nil {
		return f, false, err
	}
	if sev != "" {
		if Severity(sev).Rank() == 0 {
			return f, false, bad("severity", "%q is not significant, minor or note", sev)
		}
		f.Severity = Severity(sev)
	}
	reason, err := str("severity_reason", false)
	if err != nil {
		return f, false, err
	}
	if f.Severity != info.Severity {
		// The finding says why it differs from the check's default.
		switch {
		case reason != "":
			f.SeverityWhy = reason
		case info.Escalation != "":
			f.SeverityWhy = info.Escalation
		default:
			f.SeverityWhy = "set by the rule from the records (the check's default: " + string(info.Severity) + ")"
		}
	}
	if o, has := e.override[check]; has {
		if o == "off" {
			return f, false, nil
		}
		if Severity(o) != f.Severity {
			f.SeverityWhy = "limits override (severity: " + o + "; the check's default: " + string(info.Severity) + ")"
		}
		f.Severity = Severity(o)
		if f.Severity == info.Severity && f.SeverityWhy != "" && !strings.HasPrefix(f.SeverityWhy, "limits") {
			f.SeverityWhy = ""
		}
	}
	return f, true, nil
}

// refNamesNoRow says why ref is not a row of the record files read (lines:
// file -> its number of lines), or "" when it is. A ref is FILE:LINE, or a
// bare FILE (a file-level problem); a workbook's FILE:SHEET!ROW or
// FILE:SHEET!CELL needs its file read (its rows are not counted in lines).
func refNamesNoRow(ref string, lines map[string]int) string {
	if !strings.Contains(ref, ":") {
		if _, read := lines[ref]; !read {
			return fmt.Sprintf("%s is not a record file that was read", shorten(ref, 60))
		}
		return "" // the whole file, as a file-level problem names it
	}
	p, err := records.ParseRef(ref)
	file := p.File
	if err != nil {
		file = ref[:strings.LastIndexByte(ref, ':')]
	}
	n, read := lines[file]
	switch {
	case !read:
		return fmt.Sprintf("%s is not a record file that was read", shorten(file, 60))
	case err != nil:
		return "it is not FILE:LINE"
	case strings.HasSuffix(file, ".xlsx"):
		return "" // a workbook's sheet, row or cell: rows are not counted as lines
	case p.Sheet != "":
		return "it is not FILE:LINE" // a sheet of a text file
	case p.Line > n:
		return fmt.Sprintf("%s has %d lines", file, n)
	}
	return ""
}

// sortRefs sorts evidence by file, then line as a number, and drops
// repeats, so "care.csv:9" comes before "care.csv:10".
func sortRefs(refs []records.Ref) []records.Ref {
	if len(refs) == 0 {
		return []records.Ref{}
	}
	slices.SortFunc(refs, compareRefs)
	return slices.Compact(refs)
}

// compareRefs orders refs by file, then sheet, then line (or row) as a
// number, then text; a malformed ref sorts by its whole text, before lines.
func compareRefs(a, b records.Ref) int {
	pa, pb := refOrder(a), refOrder(b)
	if c := strings.Compare(pa.File, pb.File); c != 0 {
		return c
	}
	if c := strings.Compare(pa.Sheet, pb.Sheet); c != 0 {
		return c
	}
	if pa.Line != pb.Line {
		if pa.Line < pb.Line {
			return -1
		}
		return 1
	}
	return strings.Compare(string(a), string(b))
}

func refOrder(r records.Ref) records.RefPlace {
	p, err := records.ParseRef(string(r))
	if err != nil {
		return records.RefPlace{File: string(r), Line: -1}
	}
	return p
}

// collapseRuns merges, for checks marked runs, findings of the same check
// and subject on consecutive (or overlapping) days into one finding from
// the first to the last day. The merged finding keeps the first day's
// message, the highest severity and all evidence.
func collapseRuns(fs []Finding, checks map[string]CheckInfo) []Finding {
	type key struct{ check, subject string }
	groups := map[key][]Finding{}
	var out []Finding
	for _, f := range fs {
		if checks[f.Check].Runs {
			k := key{f.Check, f.Subject}
			groups[k] = append(groups[k], f)
			continue
		}
		out = append(out, f)
	}
	for _, g := range groups {
		slices.SortFunc(g, compareFindings)
		cur := g[0]
		for _, f := range g[1:] {
			if f.On <= runLastDay(cur)+1 {
				if runLastDay(f) > runLastDay(cur) {
					cur.Until = runLastDay(f)
				}
				if f.Severity.Rank() > cur.Severity.Rank() {
					cur.Severity = f.Severity
				}
				cur.Evidence = sortRefs(append(slices.Clone(cur.Evidence), f.Evidence...))
				continue
			}
			out = append(out, cur)
			cur = f
		}
		out = append(out, cur)
	}
	return out
}

func runLastDay(f Finding) records.Day {
	if f.Until > f.On {
		return f.Until
	}
	return f.On
}

// SortFindings puts findings in the order reports list them: most severe
// first, then domain, check, subject, first day, and last day, message and
// evidence so equal keys still come out the same way every run.
func SortFindings(fs []Finding) {
	slices.SortStableFunc(fs, func(a, b Finding) int {
		if c := b.Severity.Rank() - a.Severity.Rank(); c != 0 {
			return c
		}
		return compareFindings(a, b)
	})
}

func compareFindings(a, b Finding) int {
	if c := strings.Compare(a.Domain, b.Domain); c != 0 {
		return c
	}
	if c := strings.Compare(a.Check, b.Check); c != 0 {
		return c
	}
	if c := strings.Compare(a.Subject, b.Subject); c != 0 {
		return c
	}
	if a.On != b.On {
		return int(a.On) - int(b.On)
	}
	if a.Until != b.Until {
		return int(a.Until) - int(b.Until)
	}
	if c := strings.Compare(a.Message, b.Message); c != 0 {
		return c
	}
	if c := b.Severity.Rank() - a.Severity.Rank(); c != 0 {
		return c
	}
	return slices.CompareFunc(a.Evidence, b.Evidence, compareRefs)
}
