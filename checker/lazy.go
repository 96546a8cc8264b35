package checker

import "github.com/open-policy-agent/opa/v1/ast"

// A section of a subject's document may be given as a lazy value: compact
// Go data the fact builder keeps, and a function that makes the section's
// document value (map[string]any, []any, ... as any other section) from
// it. The converter makes the value when it converts the subject for the
// rules, converts it and lets it go, so the big maps of a section exist
// only while the subject's chunk is evaluated (check.go), not for every
// subject of every kind from the facts phase on.
//
// A builder gives &lazy{make: ...} as the section's value. A lazy value
// is always a whole section: a value of the document itself, never
// deeper. Its function is called again each time the section is
// read (nothing is remembered), must give the same value each time, and
// may share values the builder made once (a site's figures) among the
// sections it makes, as eager documents do.
//
// Everything that reads documents outside the rules' evaluation (explain,
// the report's figures, the partial counts, tests) reads them through
// resolve: section for one section, resolveDoc for a whole document.
type lazy struct {
	make func() any
	// term, when set, gives the section's OPA value directly, the value
	// converting make's gives (convert_test holds them to it), with less
	// work: the converter uses it, every other reader make.
	term func(c *converter) (*ast.Term, error)
}

// resolve gives the plain value of a document's section: a lazy section
// made, any other value as it is.
func resolve(v any) any {
	if l, ok := v.(*lazy); ok {
		return l.make()
	}
	return v
}

// section is the plain value of a document's section key (nil when the
// document has none).
func section(d map[string]any, key string) any { return resolve(d[key]) }

// resolveDoc gives a document with its lazy sections made: the document
// itself when it has none, otherwise a shallow copy (the document is not
// changed, so its sections are made again at the next read).
func resolveDoc(d map[string]any) map[string]any {
	var out map[string]any
	for k, v := range d {
		if _, ok := v.(*lazy); !ok {
			continue
		}
		if out == nil {
			out = make(map[string]any, len(d))
			for k2, v2 := range d {
				out[k2] = v2
			}
		}
		out[k] = resolve(v)
	}
	if out == nil {
		return d
	}
	return out
}

// resolveDocs resolves each document of docs (resolveDoc), in a new slice.
func resolveDocs(docs []map[string]any) []map[string]any {
	out := make([]map[string]any, len(docs))
	for i, d := range docs {
		out[i] = resolveDoc(d)
	}
	return out
}
