package checker

import (
	"errors"
	"fmt"
	"slices"
	"sort"
	"strings"

	"github.com/open-policy-agent/opa/v1/ast"

	"welfare/rules"
)

// rulePackage is one package under welfare that defines findings.
type rulePackage struct {
	name     string
	subjects []string
}

// readMetadata finds the rule packages and their checks in the modules and
// validates their METADATA, read from OPA's annotation set (the same set
// the compiler builds; it refuses a second package METADATA block in one
// package).
func readMetadata(modules map[string]*ast.Module) ([]rulePackage, map[string]CheckInfo, error) {
	var problems []string
	at := func(loc *ast.Location, format string, args ...any) {
		msg := fmt.Sprintf(format, args...)
		if loc != nil {
			msg = fmt.Sprintf("%s:%d:%d: %s", loc.File, loc.Row, loc.Col, msg)
		}
		problems = append(problems, msg)
	}

	// Modules in file order, so messages and "first definition" are stable.
	files := make([]string, 0, len(modules))
	for f := range modules {
		files = append(files, f)
	}
	sort.Strings(files)
	mods := make([]*ast.Module, len(files))
	for i, f := range files {
		mods[i] = modules[f]
	}
	as, errs := ast.BuildAnnotationSet(mods)
	if len(errs) > 0 {
		return nil, nil, compileError(errs)
	}

	// The packages under welfare that define findings, in file order.
	type pkgState struct {
		firstLoc     *ast.Location // package line of the first file that defines findings
		subjects     []string
		subjectsSeen bool
	}
	pkgs := map[string]*pkgState{}
	var order []string
	for _, m := range mods {
		name := strings.TrimPrefix(m.Package.Path.String(), "data.")
		if !strings.HasPrefix(name, "welfare.") || pkgs[name] != nil {
			continue
		}
		if slices.ContainsFunc(m.Rules, isFindings) {
			pkgs[name] = &pkgState{firstLoc: m.Package.Location}
			order = append(order, name)
		}
	}

	// Every METADATA block in file order: package blocks give the subjects,
	// rule blocks with custom.id the checks.
	refs := as.Flatten()
	slices.SortStableFunc(refs, func(x, y *ast.AnnotationsRef) int {
		return compareLoc(x.Annotations.Location, y.Annotations.Location)
	})
	checks := map[string]CheckInfo{}
	for _, ar := range refs {
		a := ar.Annotations
		pkg := ar.GetPackage()
		if pkg == nil {
			continue
		}
		name := strings.TrimPrefix(pkg.Path.String(), "data.")
		if !strings.HasPrefix(name, "welfare.") {
			continue
		}
		switch a.Scope {
		case "package":
			raw, ok := a.Custom["subjects"]
			if !ok {
				continue
			}
			subjects, err := metaStrings(raw)
			if err != nil || len(subjects) == 0 {
				at(a.Location, "package %s: custom.subjects must be a non-empty list of subject kinds (%s)", name, strings.Join(SubjectKinds, ", "))
				continue
			}
			for _, s := range subjects {
				if !slices.Contains(SubjectKinds, s) {
					at(a.Location, "package %s: unknown subject kind %q in custom.subjects (known: %s)", name, s, strings.Join(SubjectKinds, ", "))
				}
			}
			if st := pkgs[name]; st != nil {
				st.subjects, st.subjectsSeen = subjects, true
			}
		case "rule":
			info, ok := metaCheck(a, name, a.Location.File, at)
			if !ok {
				continue
			}
			if prev, dup := checks[info.ID]; dup {
				if prev.Package != info.Package {
					at(a.Location, "check %s is already defined in package %s (%s)", info.ID, prev.Package, prev.File)
				} else if !sameCheck(prev, info) {
					at(a.Location, "check %s has two different METADATA blocks in package %s", info.ID, name)
				}
				continue
			}
			checks[info.ID] = info
		}
	}

	// A finding's check id must be one its own package's METADATA defines:
	// a literal "check" in a findings rule is checked here, the rest when
	// the finding is decoded.
	for _, f := range files {
		m := modules[f]
		name := strings.TrimPrefix(m.Package.Path.String(), "data.")
		if !strings.HasPrefix(name, "welfare.") {
			continue
		}
		for _, r := range m.Rules {
			if !isFindings(r) {
				continue
			}
			ast.WalkTerms(r, func(t *ast.Term) bool {
				obj, ok := t.Value.(ast.Object)
				if !ok {
					return false
				}
				v := obj.Get(ast.StringTerm("check"))
				if v == nil {
					return false
				}
				id, ok := v.Value.(ast.String)
				if !ok {
					return false
				}
				switch c, known := checks[string(id)]; {
				case !known:
					at(v.Location, "check %s has no METADATA in package %s (title, description, custom.id, custom.severity, custom.source)", string(id), name)
				case c.Package != name:
					at(v.Location, "check %s belongs to package %s (%s), not %s", string(id), c.Package, c.File, name)
				}
				return false
			})
		}
	}

	var out []rulePackage
	for _, name := range order {
		st := pkgs[name]
		if !st.subjectsSeen {
			at(st.firstLoc, "package %s defines findings but has no package METADATA with custom.subjects (one or more of %s)", name, strings.Join(SubjectKinds, ", "))
			continue
		}
		out = append(out, rulePackage{name: name, subjects: st.subjects})
	}
	for id, c := range checks {
		for _, p := range out {
			if p.name == c.Package {
				c.Subjects = slices.Clone(p.subjects)
				checks[id] = c
			}
		}
	}
	if len(problems) > 0 {
		return nil, nil, &RulesError{Problems: problems}
	}
	return out, checks, nil
}

// checkInfo reads one rule METADATA block; ok is false when the block names
// no check (a helper rule's documentation) or is invalid (reported via at).
func metaCheck(a *ast.Annotations, pkg, file string, at func(*ast.Location, string, ...any)) (CheckInfo, bool) {
	raw, has := a.Custom["id"]
	if !has {
		return CheckInfo{}, false
	}
	id, _ := raw.(string)
	if !rules.CheckID.MatchString(id) {
		at(a.Location, "custom.id %v is not a check id of the form domain.topic.problem (or domain.problem)", raw)
		return CheckInfo{}, false
	}
	info := CheckInfo{
		ID:          id,
		Domain:      strings.SplitN(id, ".", 2)[0],
		Title:       a.Title,
		Description: a.Description,
		Package:     pkg,
		File:        file,
		Row:         a.Location.Row,
	}
	good := true
	if info.Title == "" {
		at(a.Location, "check %s: METADATA needs a title", id)
		good = false
	}
	if info.Description == "" {
		at(a.Location, "check %s: METADATA needs a description", id)
		good = false
	}
	sev, _ := a.Custom["severity"].(string)
	if Severity(sev).Rank() == 0 {
		at(a.Location, "check %s: custom.severity must be significant, minor or note, not %v", id, a.Custom["severity"])
		good = false
	}
	info.Severity = Severity(sev)
	src, _ := a.Custom["source"].(string)
	if strings.TrimSpace(src) == "" {
		at(a.Location, "check %s: METADATA needs custom.source (a published source, common practice or facility choice)", id)
		good = false
	}
	info.Source = src
	if r, has := a.Custom["runs"]; has {
		b, isBool := r.(bool)
		if !isBool {
			at(a.Location, "check %s: custom.runs must be true or false, not %v", id, r)
			good = false
		}
		info.Runs = b
	}
	if r, has := a.Custom["reportable"]; has {
		b, isBool := r.(bool)
		if !isBool {
			at(a.Location, "check %s: custom.reportable must be true or false, not %v", id, r)
			good = false
		}
		info.Reportable = b
	}
	if r, has := a.Custom["escalation"]; has {
		s, isStr := r.(string)
		if !isStr || strings.TrimSpace(s) == "" {
			at(a.Location, "check %s: custom.escalation must be a text saying when the severity departs from the default", id)
			good = false
		}
		info.Escalation = s
	}
	if r, has := a.Custom["period"]; has {
		switch s, _ := r.(string); s {
		case "day":
		case PeriodReview:
			info.Period = s
		default:
			at(a.Location, "check %s: custom.period must be day or %s, not %v", id, PeriodReview, r)
			good = false
		}
	}
	if n, has := a.Custom["needs"]; has {
		needs, err := metaStrings(n)
		if err != nil {
			at(a.Location, "check %s: custom.needs must be a list of record file names", id)
			good = false
		}
		info.Needs = needs
	}
	return info, good
}

func sameCheck(a, b CheckInfo) bool {
	return a.Title == b.Title && a.Description == b.Description && a.Severity == b.Severity &&
		a.Source == b.Source && a.Runs == b.Runs && a.Reportable == b.Reportable && a.Escalation == b.Escalation && a.Period == b.Period && slices.Equal(a.Needs, b.Needs)
}

func metaStrings(v any) ([]string, error) {
	list, ok := v.([]any)
	if !ok {
		return nil, errors.New("not a list")
	}
	out := make([]string, 0, len(list))
	for _, x := range list {
		s, ok := x.(string)
		if !ok || s == "" {
			return nil, errors.New("not a list of names")
		}
		out = append(out, s)
	}
	return out, nil
}

// isFindings reports whether r is a rule of a package's findings set.
func isFindings(r *ast.Rule) bool {
	return r.Head.Ref()[0].Value.Compare(ast.Var("findings")) == 0
}

func compareLoc(a, b *ast.Location) int {
	switch {
	case a == nil || b == nil:
		return 0
	case a.File != b.File:
		return strings.Compare(a.File, b.File)
	case a.Row != b.Row:
		return a.Row - b.Row
	}
	return a.Col - b.Col
}

// ruleSite is one findings rule: its "file:row" and, for each finding
// object it writes, the fields it gives as literal values.
type ruleSite struct {
	at       string
	literals []map[string]any
}

// matches reports whether the rule could have made the finding raw: one of
// its finding objects agrees with raw on every literal field (a rule with
// no such object could have made anything).
func (r ruleSite) matches(raw any) bool {
	obj, ok := raw.(map[string]any)
	if !ok || len(r.literals) == 0 {
		return true
	}
	for _, lits := range r.literals {
		same := true
		for k, v := range lits {
			if fmt.Sprint(obj[k]) != fmt.Sprint(v) {
				same = false
				break
			}
		}
		if same {
			return true
		}
	}
	return false
}

// ruleSites finds where findings come from, for messages about a finding a
// rule got wrong: per check id the findings rules that name it as a
// literal "check" (else the rule its METADATA block documents), and per
// package every findings rule.
func ruleSites(modules map[string]*ast.Module) (byCheck, byPackage map[string][]ruleSite) {
	byCheck, byPackage = map[string][]ruleSite{}, map[string][]ruleSite{}
	files := make([]string, 0, len(modules))
	for f := range modules {
		files = append(files, f)
	}
	sort.Strings(files)
	site := func(loc *ast.Location) string {
		if loc == nil {
			return ""
		}
		return fmt.Sprintf("%s:%d", loc.File, loc.Row)
	}
	var mods []*ast.Module
	for _, f := range files {
		m := modules[f]
		mods = append(mods, m)
		name := strings.TrimPrefix(m.Package.Path.String(), "data.")
		for _, r := range m.Rules {
			if !isFindings(r) {
				continue
			}
			rs := ruleSite{at: site(r.Location)}
			var ids []string
			ast.WalkTerms(r, func(t *ast.Term) bool {
				obj, ok := t.Value.(ast.Object)
				if !ok || obj.Get(ast.StringTerm("check")) == nil {
					return false
				}
				lits := map[string]any{}
				obj.Foreach(func(k, v *ast.Term) {
					key, ok := k.Value.(ast.String)
					if !ok {
						return
					}
					switch v.Value.(type) {
					case ast.String, ast.Number, ast.Boolean:
						if x, err := ast.JSON(v.Value); err == nil {
							lits[string(key)] = x
						}
					}
				})
				rs.literals = append(rs.literals, lits)
				if id, ok := lits["check"].(string); ok && !slices.Contains(ids, id) {
					ids = append(ids, id)
				}
				return false
			})
			byPackage[name] = append(byPackage[name], rs)
			for _, id := range ids {
				byCheck[id] = append(byCheck[id], rs)
			}
		}
	}
	as, errs := ast.BuildAnnotationSet(mods)
	if len(errs) > 0 {
		return byCheck, byPackage
	}
	for _, ar := range as.Flatten() {
		id, _ := ar.Annotations.Custom["id"].(string)
		r := ar.GetRule()
		if id == "" || r == nil {
			continue
		}
		if _, seen := byCheck[id]; !seen {
			byCheck[id] = []ruleSite{{at: site(r.Location)}}
		}
	}
	return byCheck, byPackage
}
