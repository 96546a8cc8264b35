package checker

import (
	"crypto/sha256"
	"encoding/hex"
	"path"
	"slices"
	"strings"

	"welfare/rules"
)

// RunScope is what a run covered beyond the period: every output shows it,
// so a report never reads as a pass for what was filtered, switched off or
// judged by changed limits or local rules. The fingerprint covers all of it.
type RunScope struct {
	// Only lists the domains selected by --only; empty: all.
	Only []string `json:"only"`
	// Off lists the checks the limits switch off (severity: off); they are
	// not in force and not among Result.Checks.
	Off []string `json:"off"`
	// LimitsFile is the limits file given ("" for the built-in limits);
	// LimitsWhole: read whole (--limits-replace) rather than laid over the
	// built-in limits.
	LimitsFile  string `json:"limits_file,omitempty"`
	LimitsWhole bool   `json:"limits_whole,omitempty"`
	// Changed lists the limits that differ from the built-in defaults.
	Changed []rules.LimitChange `json:"limits_changed"`
	// Local lists the rule files that are not the shipped rules, by source.
	Local []LocalRules `json:"local_rules"`
}

// LocalRules is one source's rule files that are not shipped rules, with
// the short fingerprint of their text.
type LocalRules struct {
	Source      string   `json:"source"`
	Files       []string `json:"files"`
	Fingerprint string   `json:"fingerprint"` // the first 12 hex digits of the SHA-256 over the files
}

// localFiles marks the rule files (by their name as CheckInfo.File gives
// it) whose checks are the committee's own: those of a Source marked Local,
// and those whose text is not the shipped file of the same path (an edited
// copy of a shipped package, a test policy).
func localFiles(sources []Source, files []ruleFile) map[string]bool {
	localSource := map[string]bool{}
	for _, s := range sources {
		localSource[s.Name] = s.Local
	}
	out := map[string]bool{}
	for _, f := range files {
		if localSource[f.source] || !f.shipped() {
			out[path.Join(f.source, f.path)] = true
		}
	}
	return out
}

// localRules groups the local rule files (tests left out) by source.
func localRules(files []ruleFile) []LocalRules {
	var out []LocalRules
	for _, f := range files {
		if f.shipped() || isTest(f.path) {
			continue
		}
		if len(out) == 0 || out[len(out)-1].Source != f.source {
			out = append(out, LocalRules{Source: f.source})
		}
		out[len(out)-1].Files = append(out[len(out)-1].Files, f.path)
	}
	for i := range out {
		h := sha256.New()
		for _, f := range files {
			if f.source == out[i].Source && slices.Contains(out[i].Files, f.path) {
				frame(h, f.path, f.data)
			}
		}
		out[i].Fingerprint = hex.EncodeToString(h.Sum(nil))[:12]
	}
	return out
}

func isTest(p string) bool { return strings.HasSuffix(p, "_test.rego") }

// scopeOf is the run's scope; it also takes the checks switched off out of
// the checks in force.
func scopeOf(e *engine, l *rules.Limits, only []string) (RunScope, []CheckInfo) {
	sc := RunScope{Only: append([]string{}, only...), Off: []string{}, Changed: l.Changes(), Local: localRules(e.files)}
	if sc.Changed == nil {
		sc.Changed = []rules.LimitChange{}
	}
	if sc.Local == nil {
		sc.Local = []LocalRules{}
	}
	if l.Name() != "" && l.Name() != rules.BuiltInName {
		sc.LimitsFile, sc.LimitsWhole = l.Name(), !l.Overlay()
	}
	var inForce []CheckInfo
	for _, c := range e.Checks() {
		// Rejected rows are listed whatever the limits say: "off" does not
		// switch their check off.
		if e.override[c.ID] == "off" && c.ID != RejectedCheck {
			sc.Off = append(sc.Off, c.ID)
			continue
		}
		inForce = append(inForce, c)
	}
	return sc, inForce
}
