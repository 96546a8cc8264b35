package reports

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"strings"

	"welfare/checker"
	"welfare/records"
)

// ReadFindings reads a findings file this tool wrote (`welfare check
// --json`) and returns it as a previous review. Anything else — not JSON,
// another tool's JSON, a finding without its check, subject, day or
// severity — is an error naming the file and where in it.
func ReadFindings(r io.Reader, name string) (*checker.Previous, error) {
	src, err := io.ReadAll(r)
	if err != nil {
		return nil, fmt.Errorf("%s: cannot be read: %w", name, err)
	}
	notOurs := "is not a findings file written by 'welfare check --json'"
	var raw map[string]json.RawMessage
	if err := json.Unmarshal(src, &raw); err != nil {
		return nil, fmt.Errorf("%s%s: %s (%s)", name, jsonPos(src, err), notOurs, jsonReason(err))
	}
	for _, k := range []string{"facility", "period", "fingerprint", "findings", "checks"} {
		if _, ok := raw[k]; !ok {
			return nil, fmt.Errorf("%s: %s (no %q)", name, notOurs, k)
		}
	}
	var doc JSONReport
	if err := json.Unmarshal(src, &doc); err != nil {
		return nil, fmt.Errorf("%s%s: %s (%s)", name, jsonPos(src, err), notOurs, jsonReason(err))
	}
	prev := &checker.Previous{File: name, Facility: doc.Facility}
	if prev.Period.From, err = records.ParseDay(doc.Period.From); err != nil {
		return nil, fmt.Errorf("%s: period.from: %v", name, err)
	}
	if prev.Period.To, err = records.ParseDay(doc.Period.To); err != nil {
		return nil, fmt.Errorf("%s: period.to: %v", name, err)
	}
	if prev.Period.To < prev.Period.From {
		return nil, fmt.Errorf("%s: period.to %s is before period.from %s", name, doc.Period.To, doc.Period.From)
	}
	prev.Findings = make([]checker.Finding, 0, len(doc.Findings))
	for i, jf := range doc.Findings {
		at := fmt.Sprintf("%s: findings[%d]", name, i)
		f := checker.Finding{Check: jf.Check, Domain: jf.Domain, Subject: jf.Subject, Severity: checker.Severity(jf.Severity),
			Message: jf.Message, Title: jf.Title, Source: jf.Source, Reportable: jf.Reportable}
		switch {
		case !records.IsCheckID(jf.Check):
			return nil, fmt.Errorf("%s: check %q is not a check id", at, jf.Check)
		case jf.Subject == "":
			return nil, fmt.Errorf("%s: subject is empty", at)
		case f.Severity.Rank() == 0:
			return nil, fmt.Errorf("%s: severity %q is not significant, minor or note", at, jf.Severity)
		}
		if f.On, err = records.ParseDay(jf.On); err != nil {
			return nil, fmt.Errorf("%s: on: %v", at, err)
		}
		if jf.Until != "" {
			if f.Until, err = records.ParseDay(jf.Until); err != nil {
				return nil, fmt.Errorf("%s: until: %v", at, err)
			}
		}
		if f.Domain == "" {
			f.Domain, _, _ = strings.Cut(f.Check, ".")
		}
		for _, e := range jf.Evidence {
			f.Evidence = append(f.Evidence, records.Ref(e))
		}
		prev.Findings = append(prev.Findings, f)
	}
	return prev, nil
}

// jsonPos is ":LINE:COLUMN" of a JSON decoding error, when it has an offset.
func jsonPos(src []byte, err error) string {
	var off int64 = -1
	var se *json.SyntaxError
	var te *json.UnmarshalTypeError
	switch {
	case errors.As(err, &se):
		off = se.Offset
	case errors.As(err, &te):
		off = te.Offset
	}
	if off < 0 || off > int64(len(src)) {
		return ""
	}
	// The offset is just past the byte that could not be read (at the end
	// of the input: where more was expected).
	if off > 0 && off < int64(len(src)) {
		off--
	}
	before := src[:off]
	line := bytes.Count(before, []byte("\n")) + 1
	col := int(off) - bytes.LastIndexByte(before, '\n')
	return fmt.Sprintf(":%d:%d", line, col)
}

func jsonReason(err error) string {
	var te *json.UnmarshalTypeError
	if errors.As(err, &te) {
		return fmt.Sprintf("%s is a JSON %s, not a %s", te.Field, te.Value, te.Type)
	}
	return err.Error()
}
