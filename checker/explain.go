package checker

import (
	"bufio"
	"context"
	"fmt"
	"io/fs"
	"sort"
	"strconv"
	"strings"

	"welfare/records"
)

// ExplainKey is a finding's key as a user gives it to --explain: check,
// subject and first day joined by single spaces
// ("health.weight.loss RF-416 2026-01-26").
func ExplainKey(f Finding) string {
	return f.Check + " " + f.Subject + " " + f.On.String()
}

// Explanation is why one finding fired: the document of its subject as the
// rule saw it, the limits the check reads with their values, where the rule
// is, and the record lines its evidence names.
type Explanation struct {
	Key     string
	Finding Finding
	Check   CheckInfo
	// Kind and Input are the subject's kind and input document, from a
	// second evaluation of that one subject.
	Kind  string
	Input map[string]any
	// Limits are the limits the check reads (CheckInfo.Limits), each with
	// its value in force; a part chosen at run time ([_]) gives a map.
	Limits []LimitValue
	// Evidence are the record lines the finding names.
	Evidence []EvidenceLine
}

// LimitValue is one limit a check reads and its value in force.
type LimitValue struct {
	Path  string
	Value any // nil when the limits do not have it
}

// EvidenceLine is one evidence reference with the line it names and the
// header line of its file.
type EvidenceLine struct {
	Ref    records.Ref
	Header string
	Line   string
	Err    string // why the line could not be shown
}

// Explainer answers --explain for the findings of one check run. It keeps
// the facts of that run, so each explanation evaluates one subject again:
// the normal run is untouched.
type Explainer struct {
	policy   *Policy
	records  fs.FS
	result   *Result
	facts    *facts
	findings map[string]Finding
	// correction are the second pass's documents (one per problem), built
	// as the run built them from its first-pass findings.
	correction []map[string]any
}

// Explainer checks the records as Check does and keeps what explaining a
// finding needs.
func (p *Policy) Explainer(ctx context.Context, recordsFS fs.FS, opt CheckOptions) (*Explainer, error) {
	res, set, err := p.CheckWith(ctx, recordsFS, opt)
	if err != nil {
		return nil, err
	}
	f := newFacts(set, p.limits, res.Period)
	buildFacts(f, nil)
	f.addExtra()
	x := &Explainer{policy: p, records: recordsFS, result: res, facts: f, findings: map[string]Finding{}}
	var firstPass []Finding
	for _, fd := range res.Findings {
		if fd.Domain != "correction" && fd.Check != RejectedCheck && fd.Check != MalformedCheck {
			firstPass = append(firstPass, fd)
		}
	}
	x.correction = correctionFacts(set, opt.Previous, res.Period, firstPass)
	for _, fd := range res.Findings {
		x.findings[ExplainKey(fd)] = fd
	}
	return x, nil
}

// Result is the check run's result.
func (x *Explainer) Result() *Result { return x.result }

// Explain explains the finding whose key is key (spaces between its parts
// may be repeated). A key no finding has is an error naming the keys of
// that check, or saying how to list them.
func (x *Explainer) Explain(ctx context.Context, key string) (*Explanation, error) {
	key = strings.Join(strings.Fields(key), " ")
	fd, ok := x.findings[key]
	if !ok {
		return nil, x.unknownKey(key)
	}
	var info CheckInfo
	for _, c := range x.result.Checks {
		if c.ID == fd.Check {
			info = c
		}
	}
	ex := &Explanation{Key: key, Finding: fd, Check: info}
	// The subject's own document first; a finding about a part of a
	// subject (a building's mortality on the facility document, a
	// rejected row) is found by evaluating the documents of its kinds.
	for _, kind := range info.Subjects {
		docs := x.facts.inputs(kind)
		if kind == correctionKind {
			docs = x.correction
		}
		if d, ok := x.facts.docs[kind][fd.Subject]; ok {
			docs = []map[string]any{d}
		}
		for _, d := range docs {
			found, err := x.policy.engine.Evaluate(ctx, kind, []map[string]any{d})
			if err != nil {
				return nil, err
			}
			for _, g := range found {
				if ExplainKey(g) == key {
					ex.Kind, ex.Input = kind, resolveDoc(d)
					break
				}
			}
			if ex.Input != nil {
				break
			}
		}
		if ex.Input != nil {
			break
		}
	}
	if ex.Input == nil {
		return nil, fmt.Errorf("finding %s: evaluating its subject again did not give it back", key)
	}
	for _, path := range info.Limits {
		v, _ := limitValue(x.policy.data, limitTokens(path))
		ex.Limits = append(ex.Limits, LimitValue{Path: path, Value: v})
	}
	for _, ref := range fd.Evidence {
		ex.Evidence = append(ex.Evidence, evidenceLine(x.records, ref))
	}
	return ex, nil
}

func (x *Explainer) unknownKey(key string) error {
	check, _, _ := strings.Cut(key, " ")
	var same []string
	for k := range x.findings {
		if strings.HasPrefix(k, check+" ") {
			same = append(same, k)
		}
	}
	if len(same) == 0 {
		return fmt.Errorf("--explain: no finding has the key %q (a key is CHECK SUBJECT YYYY-MM-DD: a finding's check, subject and first day)", key)
	}
	sort.Strings(same)
	if len(same) > 10 {
		same = append(same[:10], "…")
	}
	return fmt.Errorf("--explain: no finding has the key %q; the findings of %s are: %s", key, check, strings.Join(same, "; "))
}

// limitTokens splits "species[_].bite_risk" into species, [_], bite_risk.
func limitTokens(path string) []string {
	var out []string
	for _, part := range strings.Split(path, ".") {
		for part != "" {
			i := strings.Index(part, "[_]")
			switch {
			case i < 0:
				out = append(out, part)
				part = ""
			case i > 0:
				out = append(out, part[:i])
				part = part[i:]
			default:
				out = append(out, "[_]")
				part = part[3:]
			}
		}
	}
	return out
}

// limitValue reads a tokenised limit path from the limits document; [_]
// maps every key of the map there to the value of the rest of the path.
func limitValue(v any, tokens []string) (any, bool) {
	if len(tokens) == 0 {
		return v, true
	}
	if tokens[0] == "[_]" && len(tokens) == 1 {
		return v, true // every entry of a list or map: the whole of it
	}
	if list, ok := v.([]any); ok && tokens[0] == "[_]" {
		out := []any{}
		for _, e := range list {
			if r, ok := limitValue(e, tokens[1:]); ok {
				out = append(out, r)
			}
		}
		return out, true
	}
	m, ok := v.(map[string]any)
	if !ok {
		return nil, false
	}
	if tokens[0] != "[_]" {
		next, ok := m[tokens[0]]
		if !ok {
			return nil, false
		}
		return limitValue(next, tokens[1:])
	}
	out := map[string]any{}
	for k, e := range m {
		if r, ok := limitValue(e, tokens[1:]); ok {
			out[k] = r
		}
	}
	return out, true
}

// evidenceLine reads the line a FILE:LINE reference names, and its file's
// first line (the header of a CSV file).
func evidenceLine(fsys fs.FS, ref records.Ref) EvidenceLine {
	out := EvidenceLine{Ref: ref}
	s := string(ref)
	i := strings.LastIndexByte(s, ':')
	n, err := strconv.Atoi(s[i+1:])
	if i < 0 || err != nil || n < 1 {
		out.Err = "not a FILE:LINE reference"
		return out
	}
	file, err := fsys.Open(s[:i])
	if err != nil {
		out.Err = "the file cannot be read: " + err.Error()
		return out
	}
	defer file.Close()
	sc := bufio.NewScanner(file)
	sc.Buffer(make([]byte, 0, 64*1024), records.MaxLineBytes)
	for line := 1; sc.Scan(); line++ {
		if line == 1 {
			out.Header = sc.Text()
		}
		if line == n {
			out.Line = sc.Text()
			return out
		}
	}
	out.Err = fmt.Sprintf("the file has fewer than %d lines", n)
	return out
}
