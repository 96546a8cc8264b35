package reports

import (
	"bufio"
	"fmt"
	"io"
	"strings"

	"welfare/checker"
)

// The scope of a run is shown on every output (the PDF's cover, the top of
// the terminal summary, JSON's "scope", the CSV's side file): a signed
// report says what it was limited to, what the limits switched off or
// changed, and which rules are not the shipped ones, so that it never
// reads as a pass for what it did not judge.

// scopeItem is one line of the scope: a label, its value, and the lines
// listed under it.
type scopeItem struct {
	Label, Value string
	More         []string
}

// scopeItems are the scope's lines, in the same words on every output.
func scopeItems(r *checker.Result) []scopeItem {
	sc := r.Scope
	out := []scopeItem{{Label: "Period", Value: dayOrNone(r.Period.From) + " to " + dayOrNone(r.Period.To) + " (inclusive)"}}
	if len(sc.Only) == 0 {
		out = append(out, scopeItem{Label: "Checks selected", Value: "all"})
	} else {
		out = append(out, scopeItem{Label: "Checks selected", Value: "only " + strings.Join(sc.Only, ", ") +
			" (--only): the findings of every other domain are left out of this report"})
	}
	switch len(sc.Off) {
	case 0:
		out = append(out, scopeItem{Label: "Switched off", Value: "none"})
	default:
		out = append(out, scopeItem{Label: "Switched off", Value: plural(len(sc.Off), "check") +
			" by the limits (severity: off), not in force: " + strings.Join(sc.Off, ", ")})
	}
	lim := scopeItem{Label: "Limits", Value: "the built-in defaults"}
	switch {
	case sc.LimitsFile != "" && sc.LimitsWhole:
		lim.Value = sc.LimitsFile + ", a whole limits file (--limits-replace)"
	case sc.LimitsFile != "":
		lim.Value = sc.LimitsFile + ", laid over the built-in defaults"
	}
	if n := len(sc.Changed); n > 0 {
		lim.Value += fmt.Sprintf("; %s from the defaults (old → new):", plural(n, "change"))
		for _, c := range sc.Changed {
			lim.More = append(lim.More, c.Line())
		}
	} else if sc.LimitsFile != "" {
		lim.Value += "; no value differs from the defaults"
	}
	out = append(out, lim)
	loc := scopeItem{Label: "Local rules", Value: "none (only the shipped rules)"}
	if len(sc.Local) > 0 {
		n := 0
		for _, l := range sc.Local {
			n += len(l.Files)
			loc.More = append(loc.More, fmt.Sprintf("%s: %s (fingerprint %s)", l.Source, strings.Join(l.Files, ", "), l.Fingerprint))
		}
		loc.Value = plural(n, "rule file") + " not shipped with welfare; their checks are marked local:"
	}
	out = append(out, loc)
	ne := scopeItem{Label: "Not evaluated", Value: "none: every check in force was evaluated"}
	if n := len(r.NotEvaluated); n > 0 {
		ne.Value = fmt.Sprintf("%d of the %s in force (listed with the reasons)", n, plural(len(r.Checks), "check"))
	}
	out = append(out, ne)
	return out
}

// writeScope writes the scope as plain lines, "Label: value", each listed
// line indented under it.
func writeScope(b *bufio.Writer, r *checker.Result) {
	for _, it := range scopeItems(r) {
		fmt.Fprintf(b, "%s: %s\n", it.Label, it.Value)
		for _, m := range it.More {
			fmt.Fprintf(b, "  %s\n", m)
		}
	}
}

// WriteScope writes the run's scope and fingerprint as plain text: the
// side file written beside findings.csv (findings.scope.txt), so the CSV
// itself stays one header row and one finding per row for spreadsheets.
func WriteScope(w io.Writer, r *checker.Result) error {
	b := bufio.NewWriter(w)
	fmt.Fprintf(b, "Scope of %s (findings.csv of the same run)\n", orNone(r.Facility))
	fmt.Fprintf(b, "Fingerprint: %s\n", orNone(r.Fingerprint))
	writeScope(b, r)
	if len(r.NotEvaluated) > 0 {
		fmt.Fprintf(b, "Checks not evaluated (%d)\n", len(r.NotEvaluated))
		for _, s := range r.NotEvaluated {
			fmt.Fprintf(b, "  %s: %s\n", s.Check, s.Reason)
		}
	}
	return b.Flush()
}

// JSONScope is findings.json's "scope": what the run covered.
type JSONScope struct {
	// Only: the domains selected by --only; empty: all.
	Only []string `json:"only"`
	// Off: checks switched off by the limits (severity: off), not in force.
	Off []string `json:"off"`
	// LimitsFile: the limits file given, "" for the built-in defaults;
	// LimitsWhole: read whole (--limits-replace), not laid over the defaults.
	LimitsFile  string `json:"limits_file"`
	LimitsWhole bool   `json:"limits_whole"`
	// LimitsChanged: each limit that differs from the built-in default.
	LimitsChanged []JSONLimitChange `json:"limits_changed"`
	// LocalRules: rule files that are not the shipped ones, by source.
	LocalRules []JSONLocalRules `json:"local_rules"`
}

// JSONLimitChange is one limit changed from the default; old is "" for a
// value the defaults do not have, new "" for one removed.
type JSONLimitChange struct {
	Key    string `json:"key"`
	Old    string `json:"old"`
	New    string `json:"new"`
	Source string `json:"source"`
}

// JSONLocalRules is one source's local rule files and their short fingerprint.
type JSONLocalRules struct {
	Source      string   `json:"source"`
	Files       []string `json:"files"`
	Fingerprint string   `json:"fingerprint"`
}

func newJSONScope(sc checker.RunScope) JSONScope {
	out := JSONScope{Only: append([]string{}, sc.Only...), Off: append([]string{}, sc.Off...),
		LimitsFile: sc.LimitsFile, LimitsWhole: sc.LimitsWhole,
		LimitsChanged: []JSONLimitChange{}, LocalRules: []JSONLocalRules{}}
	for _, c := range sc.Changed {
		out.LimitsChanged = append(out.LimitsChanged, JSONLimitChange(c))
	}
	for _, l := range sc.Local {
		out.LocalRules = append(out.LocalRules, JSONLocalRules{Source: l.Source, Files: l.Files, Fingerprint: l.Fingerprint})
	}
	return out
}
