package checker

import (
	"slices"
	"sort"
	"strings"

	"github.com/open-policy-agent/opa/v1/ast"
)

// limitReads finds, in the compiled modules, the limits each check reads:
// every data.limits reference of the findings rules that produce the check
// (those naming its id as a literal "check"), and of the rules and
// functions of the package they call, through aliases such as
// `lim := data.limits.health`. A part chosen at run time (a species, a
// purpose) is written [_]: "species[_].bite_risk". Sorted, without repeats.
func limitReads(modules map[string]*ast.Module, checks map[string]CheckInfo) map[string][]string {
	index := map[string][]*ast.Rule{}
	var findingsRules []*ast.Rule
	for _, m := range modules {
		for _, r := range m.Rules {
			// A compiled rule's head reference is its whole path.
			path := r.Ref().GroundPrefix().String()
			index[path] = append(index[path], r)
			if isFindings(r) {
				findingsRules = append(findingsRules, r)
			}
		}
	}
	byCheck := map[string][]*ast.Rule{}
	for _, r := range findingsRules {
		for _, id := range literalChecks(r) {
			byCheck[id] = append(byCheck[id], r)
		}
	}
	out := map[string][]string{}
	for id := range checks {
		seen := map[*ast.Rule]bool{}
		reads := map[string]bool{}
		for _, r := range byCheck[id] {
			limitRefsOf(r, index, seen, reads)
		}
		var list []string
		for k := range reads {
			if !coveredBy(k, reads) {
				list = append(list, k)
			}
		}
		sort.Strings(list)
		out[id] = list
	}
	return out
}

// literalChecks lists the check ids a findings rule writes as literals.
func literalChecks(r *ast.Rule) []string {
	var ids []string
	ast.WalkTerms(r, func(t *ast.Term) bool {
		obj, ok := t.Value.(ast.Object)
		if !ok {
			return false
		}
		if v := obj.Get(ast.StringTerm("check")); v != nil {
			if s, ok := v.Value.(ast.String); ok && !slices.Contains(ids, string(s)) {
				ids = append(ids, string(s))
			}
		}
		return false
	})
	return ids
}

var limitsRoot = ast.MustParseRef("data.limits")

// limitRefsOf adds the limits rule r reads to reads, following the rules
// of data it refers to.
func limitRefsOf(r *ast.Rule, index map[string][]*ast.Rule, seen map[*ast.Rule]bool, reads map[string]bool) {
	if seen[r] {
		return
	}
	seen[r] = true
	ast.WalkRefs(r, func(ref ast.Ref) bool {
		switch {
		case ref.HasPrefix(limitsRoot):
			if !isAliasValue(r, ref) {
				reads[limitPath(ref)] = true
			}
		case ref[0].Equal(ast.DefaultRootDocument):
			// The longest prefix of ref that names rules: the rest reads
			// into their value.
			for n := len(ref); n > 1; n-- {
				prefix := ref[:n]
				if !prefix.IsGround() {
					continue
				}
				rules := index[prefix.String()]
				if len(rules) == 0 {
					continue
				}
				for _, called := range rules {
					if alias := aliasOf(called); alias != nil {
						reads[limitPath(alias.Concat(ref[n:]))] = true
						continue
					}
					limitRefsOf(called, index, seen, reads)
				}
				break
			}
		}
		return false
	})
}

// aliasOf is the data.limits reference a rule such as `lim :=
// data.limits.health` stands for (compiled: lim = x if x =
// data.limits.health), or nil.
func aliasOf(r *ast.Rule) ast.Ref {
	if len(r.Head.Args) > 0 || r.Head.Value == nil || len(r.Body) != 1 {
		return nil
	}
	v, ok := r.Head.Value.Value.(ast.Var)
	if !ok || !r.Body[0].IsEquality() {
		return nil
	}
	terms := r.Body[0].Operands()
	for i, t := range terms {
		ref, isRef := t.Value.(ast.Ref)
		if isRef && ref.HasPrefix(limitsRoot) && ref.IsGround() && terms[1-i].Value.Compare(v) == 0 {
			return ref
		}
	}
	return nil
}

func isAliasValue(r *ast.Rule, ref ast.Ref) bool {
	a := aliasOf(r)
	return a != nil && a.Equal(ref)
}

// limitPath writes a data.limits reference as the limits file's dotted
// path, [_] for a part chosen at run time.
func limitPath(ref ast.Ref) string {
	var b strings.Builder
	for _, t := range ref[2:] {
		if s, ok := t.Value.(ast.String); ok {
			if b.Len() > 0 {
				b.WriteByte('.')
			}
			b.WriteString(string(s))
			continue
		}
		b.WriteString("[_]")
	}
	if b.Len() == 0 {
		return "(all the limits)"
	}
	return b.String()
}

// coveredBy reports whether a shorter path in reads already holds path
// ("staff.rabies" holds "staff.rabies.min_titer_iu_ml").
func coveredBy(path string, reads map[string]bool) bool {
	for i := range path {
		if (path[i] == '.' || path[i] == '[') && reads[path[:i]] {
			return true
		}
	}
	return false
}
