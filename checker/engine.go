package checker

import (
	"context"
	"errors"
	"fmt"
	"runtime"
	"slices"
	"sort"
	"strconv"
	"strings"
	"time"

	"github.com/open-policy-agent/opa/v1/ast"
	"github.com/open-policy-agent/opa/v1/rego"
	"github.com/open-policy-agent/opa/v1/storage"
	"github.com/open-policy-agent/opa/v1/storage/inmem"
)

// Options tune policy evaluation. The zero value is usable.
type Options struct {
	// Timeout is the time budget of one policy evaluation for one subject
	// (default 5s). User rules are untrusted, so a runaway loop must not hang
	// an inspection.
	Timeout time.Duration
	// PackageBudget is the time budget of one rule package across all the
	// subjects of one check (default 60s): the evaluation time of its
	// subjects added up, however many workers ran them.
	PackageBudget time.Duration
	// TotalBudget is the wall time budget of the whole evaluation of one
	// check, every package and subject (default 5 minutes).
	TotalBudget time.Duration
	// Workers is the number of subjects evaluated at once (default
	// runtime.GOMAXPROCS(0)).
	Workers int
	// Progress, when set, is told when each phase of a check starts
	// ("load", "facts", "rules", with done 0) and how far it has gone: rows
	// read while loading, subjects evaluated while judging. It only
	// reports, for timings and a progress display.
	Progress func(phase string, done int)
}

// SubjectKinds are the kinds of subject a rule package can receive facts
// about, named in its package METADATA as custom.subjects.
// The correction kind is evaluated in a second pass, on this period's
// findings (facts_correction.go).
var SubjectKinds = []string{"facility", "enclosure", "animal", "staff", "item", "protocol", "site", "building", "correction"}

// The default time budgets (Options).
const (
	DefaultTimeout       = 5 * time.Second
	DefaultPackageBudget = 60 * time.Second
	DefaultTotalBudget   = 5 * time.Minute
)

// ErrTimeBudget is wrapped by the error Evaluate returns when one
// evaluation runs out of its time budget.
var ErrTimeBudget = errors.New("time budget ran out")

// engine holds compiled welfare rules, one prepared query per rule package
// and one per subject kind of several packages (kindQuery). It is safe for
// concurrent use once built.
type engine struct {
	opt    Options
	checks map[string]CheckInfo
	sorted []CheckInfo
	kinds  map[string][]*packageQuery
	// groups has, per subject kind of two or more packages, the one query
	// that evaluates all of them on a subject (kindQuery).
	groups   map[string]*kindQuery
	override map[string]string // check id -> severity or "off", from data.limits.severity
	files    []ruleFile        // the rule files compiled, in the order read
	// ruleAt is, per check id, the findings rules that make its findings;
	// packageRules every findings rule of a package.
	ruleAt       map[string][]ruleSite
	packageRules map[string][]ruleSite
	// store holds data.limits; each worker of Evaluate reads it through
	// one read transaction of its own for all its evaluations.
	store storage.Store
	// packages is the number of rule packages (packageQuery.index).
	packages int
}

// ruleFile is one rule file as read: its source, its path in the source,
// and its text.
type ruleFile struct {
	source, path string
	data         []byte
}

// packageQuery is the prepared `findings` query of one rule package.
type packageQuery struct {
	name  string // welfare.care
	index int    // in the run's time spent per package (evalRun.spent)
	query rego.PreparedEvalQuery
}

// newEngine parses and compiles the rules of sources (files ending in
// _test.rego are left out), reads their METADATA, and prepares one query per
// rule package and one per subject kind (prepareGroup). limits are available
// to the rules as data.limits. A problem in the rules is returned as a
// *RulesError.
func newEngine(ctx context.Context, sources []Source, limits map[string]any, opt Options) (*engine, error) {
	if opt.Timeout <= 0 {
		opt.Timeout = DefaultTimeout
	}
	if opt.PackageBudget <= 0 {
		opt.PackageBudget = DefaultPackageBudget
	}
	if opt.TotalBudget <= 0 {
		opt.TotalBudget = DefaultTotalBudget
	}
	if opt.Workers <= 0 {
		opt.Workers = runtime.GOMAXPROCS(0)
	}
	override, err := severityOverrides(limits)
	if err != nil {
		return nil, err
	}
	modules, files, err := parseSources(sources, false)
	if err != nil {
		return nil, err
	}
	caps := sandboxCapabilities()
	schemas, err := typeInputs(modules)
	if err != nil {
		return nil, err
	}
	compiler := newCompiler(caps).WithSchemas(schemas).WithUseTypeCheckAnnotations(true)
	compiler.Compile(modules)
	if compiler.Failed() {
		return nil, compileError(compiler.Errors)
	}
	pkgs, checks, err := readMetadata(modules)
	if err != nil {
		return nil, err
	}
	for id, reads := range limitReads(compiler.Modules, checks) {
		c := checks[id]
		c.Limits = reads
		checks[id] = c
	}
	store := limitsStore(limits)
	ruleAt, packageRules := ruleSites(modules)

	e := &engine{
		opt:      opt,
		checks:   checks,
		kinds:    map[string][]*packageQuery{},
		override: override,
		files:    files,

		ruleAt:       ruleAt,
		packageRules: packageRules,
		store:        store,
		packages:     len(pkgs),
	}
	local := localFiles(sources, files)
	for id, c := range checks {
		c.Local = local[c.File]
		checks[id] = c
		e.sorted = append(e.sorted, c)
	}
	sort.Slice(e.sorted, func(i, j int) bool { return e.sorted[i].ID < e.sorted[j].ID })

	for i, p := range pkgs {
		r := rego.New(
			rego.Compiler(compiler),
			rego.Store(store),
			rego.Capabilities(caps),
			rego.Query("data."+p.name+".findings"),
			rego.StrictBuiltinErrors(true),
		)
		pq, err := r.PrepareForEval(ctx)
		if err != nil {
			return nil, fmt.Errorf("%s: preparing the findings query: %w", p.name, err)
		}
		q := &packageQuery{name: p.name, index: i, query: pq}
		for _, k := range p.subjects {
			e.kinds[k] = append(e.kinds[k], q)
		}
	}
	e.groups = map[string]*kindQuery{}
	for kind, qs := range e.kinds {
		g, err := prepareGroup(ctx, compiler, store, caps, qs)
		if err != nil {
			return nil, fmt.Errorf("%s subjects: preparing the findings query of every package: %w", kind, err)
		}
		if g != nil {
			e.groups[kind] = g
		}
	}
	return e, nil
}

// kindQuery is the prepared query of every rule package of one subject
// kind, in one evaluation per subject instead of one per package: a
// package's own evaluation costs the evaluator's set-up (its state, caches
// and the store's reads) on every subject, about a tenth of the shipped
// rules' time.
//
// The query reads each package's findings in the packages' order, with a
// mark after each package but the last:
//
//	f0 = data.welfare.care.findings; print(); f1 = data.welfare.cold.findings; ...
//
// The evaluation calls the worker's print hook (evalWorker.Print) at each
// mark, so each package still has its own time: its time budget (the
// timer is set again at each mark), the time charged to its package budget
// and the name on a time-out or an error are those of the package being
// evaluated, as when each package was evaluated on its own.
type kindQuery struct {
	query rego.PreparedEvalQuery
	pkgs  []*packageQuery
	vars  []string // the binding of each package's findings
	marks []int    // marks[i]: the column in the query of the mark before pkgs[i] (i ≥ 1)
}

// prepareGroup prepares the kindQuery of the packages qs of one kind, or
// returns nil when they are evaluated one by one: a single package, or a
// package whose findings is not a set made by `findings contains` rules
// (always defined, a set, so that one package can neither leave the
// query undefined and lose the others' findings, nor be reported in
// another order than on its own).
func prepareGroup(ctx context.Context, compiler *ast.Compiler, store storage.Store, caps *ast.Capabilities, qs []*packageQuery) (*kindQuery, error) {
	if len(qs) < 2 {
		return nil, nil
	}
	g := &kindQuery{pkgs: qs, vars: make([]string, len(qs)), marks: make([]int, len(qs))}
	var query strings.Builder
	for i, q := range qs {
		ref, err := ast.ParseRef("data." + q.name + ".findings")
		if err != nil {
			return nil, nil
		}
		rules := compiler.GetRulesExact(ref)
		if len(rules) == 0 {
			return nil, nil
		}
		for _, r := range rules {
			if r.Head.RuleKind() != ast.MultiValue || r.Default {
				return nil, nil
			}
		}
		if i > 0 {
			query.WriteString("; ")
			g.marks[i] = query.Len() + 1 // the column of the mark (the query is one line)
			query.WriteString("print(); ")
		}
		g.vars[i] = "f" + strconv.Itoa(i)
		fmt.Fprintf(&query, "%s = data.%s.findings", g.vars[i], q.name)
	}
	r := rego.New(
		rego.Compiler(compiler),
		rego.Store(store),
		rego.Capabilities(caps),
		rego.Query(query.String()),
		rego.StrictBuiltinErrors(true),
		rego.EnablePrintStatements(true),
	)
	pq, err := r.PrepareForEval(ctx)
	if err != nil {
		return nil, err
	}
	g.query = pq
	return g, nil
}

// Checks lists the metadata of every check the rules define, sorted by id.
func (e *engine) Checks() []CheckInfo {
	out := make([]CheckInfo, len(e.sorted))
	for i, c := range e.sorted {
		c.Needs = slices.Clone(c.Needs)
		c.Subjects = slices.Clone(c.Subjects)
		c.Limits = slices.Clone(c.Limits)
		out[i] = c
	}
	return out
}

// Kinds lists the subject kinds at least one rule package receives, sorted.
func (e *engine) Kinds() []string {
	var out []string
	for k := range e.kinds {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}

// severityOverrides reads limits' severity: map (check id -> significant,
// minor, note or off).
func severityOverrides(limits map[string]any) (map[string]string, error) {
	out := map[string]string{}
	raw, ok := limits["severity"]
	if !ok || raw == nil {
		return out, nil
	}
	m, ok := raw.(map[string]any)
	if !ok {
		return nil, fmt.Errorf("limits: severity must map check ids to significant, minor, note or off, not %T", raw)
	}
	for id, v := range m {
		s, _ := v.(string)
		if s != "off" && Severity(s).Rank() == 0 {
			return nil, fmt.Errorf("limits: severity.%s: %v is not significant, minor, note or off", id, v)
		}
		out[id] = s
	}
	return out, nil
}

// limitsStore holds the limits as data.limits, read-only. limits is a
// plain JSON document (rules.Limits.Data), converted once per run.
func limitsStore(limits map[string]any) storage.Store {
	if limits == nil {
		limits = map[string]any{}
	}
	data := map[string]any{"limits": limits}
	return inmem.NewFromObjectWithOpts(data, inmem.OptRoundTripOnWrite(false), inmem.OptReturnASTValuesOnRead(true))
}
