package reports

import (
	"strings"
	"unicode/utf8"
)

// appendFinding appends f as encoding/json writes it with the indent
// WriteJSON streams findings with (prefix "    ", two spaces a level,
// HTML not escaped), without the trailing newline: the same bytes,
// written by hand because at hundreds of thousands of findings the
// reflection and re-indenting of the general encoder were most of the
// time findings.json took. TestAppendFindingAsEncoder holds the two equal,
// field by field, and fails when JSONFinding gains a field this does not
// write.
func appendFinding(b []byte, f *JSONFinding) []byte {
	const field = "\n      \""
	b = append(b, '{')
	b = appendField(b, field, "severity", f.Severity, false)
	b = appendField(b, field, "severity_why", f.SeverityWhy, true)
	b = appendField(b, field, "check", f.Check, false)
	b = appendField(b, field, "domain", f.Domain, false)
	b = appendField(b, field, "subject", f.Subject, false)
	b = appendField(b, field, "on", f.On, false)
	b = appendField(b, field, "until", f.Until, true)
	b = appendField(b, field, "message", f.Message, false)
	b = append(b, ',')
	b = append(b, field...)
	b = append(b, `evidence": `...)
	switch {
	case f.Evidence == nil:
		b = append(b, "null"...)
	case len(f.Evidence) == 0:
		b = append(b, "[]"...)
	default:
		b = append(b, '[')
		for i, e := range f.Evidence {
			if i > 0 {
				b = append(b, ',')
			}
			b = append(b, "\n        "...)
			b = appendString(b, e)
		}
		b = append(b, "\n      ]"...)
	}
	b = appendField(b, field, "title", f.Title, false)
	b = appendField(b, field, "source", f.Source, false)
	if f.Reportable {
		b = append(b, ',')
		b = append(b, field...)
		b = append(b, `reportable": true`...)
	}
	b = appendField(b, field, "report_to", f.ReportTo, true)
	b = appendField(b, field, "key", f.Key, false)
	b = appendField(b, field, "problem", f.Problem, false)
	b = appendField(b, field, "class", f.Class, true)
	if a := f.Action; a != nil {
		const inner = "\n        \""
		b = append(b, ',')
		b = append(b, field...)
		b = append(b, `action": {`...)
		b = append(b, inner...)
		b = append(b, `plan": `...)
		b = appendString(b, a.Plan)
		b = appendField(b, inner, "owner", a.Owner, true)
		b = appendField(b, inner, "due_on", a.DueOn, false)
		b = appendField(b, inner, "status", a.Status, false)
		b = append(b, "\n      }"...)
	}
	if f.Local {
		b = append(b, ',')
		b = append(b, field...)
		b = append(b, `local": true`...)
	}
	return append(b, "\n    }"...)
}

// appendField appends `,` (except before the first field, which the
// caller opens), the line's indent, the key and the string value; nothing
// when omitEmpty and the value is empty, as the omitempty tag does.
func appendField(b []byte, indent, key, value string, omitEmpty bool) []byte {
	if omitEmpty && value == "" {
		return b
	}
	if b[len(b)-1] != '{' {
		b = append(b, ',')
	}
	b = append(b, indent...)
	b = append(b, key...)
	b = append(b, `": `...)
	return appendString(b, value)
}

// appendString appends s quoted as encoding/json quotes it with HTML left
// as it is: plain text (no control characters, quotes, backslashes,
// invalid UTF-8 or line/paragraph separators) copied whole, anything else
// escaped as encoding/json escapes it (TestAppendStringAsEncoder and
// FuzzAppendString hold the two equal).
func appendString(b []byte, s string) []byte {
	b = append(b, '"')
	if plainJSON(s) {
		b = append(b, s...)
		return append(b, '"')
	}
	const hex = "0123456789abcdef"
	for i := 0; i < len(s); {
		c := s[i]
		if c < utf8.RuneSelf {
			switch {
			case c == '"' || c == '\\':
				b = append(b, '\\', c)
			case c == '\b':
				b = append(b, '\\', 'b')
			case c == '\f':
				b = append(b, '\\', 'f')
			case c == '\n':
				b = append(b, '\\', 'n')
			case c == '\r':
				b = append(b, '\\', 'r')
			case c == '\t':
				b = append(b, '\\', 't')
			case c < 0x20:
				b = append(b, '\\', 'u', '0', '0', hex[c>>4], hex[c&0xf])
			default:
				b = append(b, c)
			}
			i++
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		switch {
		case r == utf8.RuneError && size == 1:
			b = append(b, `\ufffd`...)
		case r == '\u2028':
			b = append(b, `\u2028`...)
		case r == '\u2029':
			b = append(b, `\u2029`...)
		default:
			b = append(b, s[i:i+size]...)
		}
		i += size
	}
	return append(b, '"')
}

// plainJSON reports whether encoding/json writes s between quotes as it is.
func plainJSON(s string) bool {
	ascii := true
	for i := 0; i < len(s); i++ {
		c := s[i]
		if c < 0x20 || c == '"' || c == '\\' {
			return false
		}
		if c >= utf8.RuneSelf {
			ascii = false
		}
	}
	if ascii {
		return true
	}
	return utf8.ValidString(s) && !strings.ContainsRune(s, '\u2028') && !strings.ContainsRune(s, '\u2029')
}
