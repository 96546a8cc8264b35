package checker

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io/fs"
	"path"
	"regexp"
	"runtime"
	"slices"
	"sort"
	"strconv"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"github.com/open-policy-agent/opa/v1/ast"
	"github.com/open-policy-agent/opa/v1/rego"
	"github.com/open-policy-agent/opa/v1/storage"
	"github.com/open-policy-agent/opa/v1/storage/inmem"
	"github.com/open-policy-agent/opa/v1/topdown"

	"welfare/records"
)

// Source is one set of Rego files: the embedded shipped rules or a folder a
// committee points at. Name prefixes the file paths shown in messages
// ("rules/care.rego:12:3: ...").
type Source struct {
	Name string
	FS   fs.FS
}

// EngineOptions tune policy evaluation. The zero value is usable.
type EngineOptions struct {
	// Timeout is the time budget of one policy evaluation for one subject
	// (default 5s). User rules are untrusted, so a runaway loop must not hang
	// an inspection.
	Timeout time.Duration
	// Workers is the number of subjects evaluated at once (default
	// runtime.GOMAXPROCS(0)).
	Workers int
}

// SubjectKinds are the kinds of subject a rule package can receive facts
// about, named in its package METADATA as custom.subjects.
// The correction kind is evaluated in a second pass, on this period's
// findings (facts_correction.go).
var SubjectKinds = []string{"facility", "enclosure", "animal", "staff", "item", "protocol", "site", "building", "correction"}

// ErrTimeBudget is wrapped by the error Evaluate returns when one
// evaluation runs out of its time budget.
var ErrTimeBudget = errors.New("time budget ran out")

// RulesError lists every problem that stops a rule set from loading: parse
// errors, compile errors and bad METADATA, each as "file:row:col: message".
type RulesError struct {
	Problems []string
}

// Error is one problem per line.
func (e *RulesError) Error() string {
	return strings.Join(e.Problems, "\n")
}

// Engine holds compiled welfare rules and one prepared query per rule
// package. It is safe for concurrent use once built.
type Engine struct {
	opt      EngineOptions
	checks   map[string]CheckInfo
	sorted   []CheckInfo
	kinds    map[string][]*packageQuery
	override map[string]string // check id -> severity or "off", from data.limits.severity
}

// packageQuery is the prepared `findings` query of one rule package.
type packageQuery struct {
	name  string // welfare.care
	query rego.PreparedEvalQuery
}

// NewEngine parses and compiles the rules of sources (files ending in
// _test.rego are left out), reads their METADATA, and prepares one query per
// rule package. limits are available to the rules as data.limits. A problem
// in the rules is returned as a *RulesError.
func NewEngine(ctx context.Context, sources []Source, limits map[string]any, opt EngineOptions) (*Engine, error) {
	if opt.Timeout <= 0 {
		opt.Timeout = 5 * time.Second
	}
	if opt.Workers <= 0 {
		opt.Workers = runtime.GOMAXPROCS(0)
	}
	override, err := severityOverrides(limits)
	if err != nil {
		return nil, err
	}
	modules, err := parseSources(sources, false)
	if err != nil {
		return nil, err
	}
	caps := sandboxCapabilities()
	compiler := newCompiler(caps)
	compiler.Compile(modules)
	if compiler.Failed() {
		return nil, compileError(compiler.Errors)
	}
	pkgs, checks, err := readMetadata(modules)
	if err != nil {
		return nil, err
	}
	store, err := limitsStore(limits)
	if err != nil {
		return nil, err
	}

	e := &Engine{
		opt:      opt,
		checks:   checks,
		kinds:    map[string][]*packageQuery{},
		override: override,
	}
	for _, c := range checks {
		e.sorted = append(e.sorted, c)
	}
	sort.Slice(e.sorted, func(i, j int) bool { return e.sorted[i].ID < e.sorted[j].ID })

	for _, p := range pkgs {
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
		q := &packageQuery{name: p.name, query: pq}
		for _, k := range p.subjects {
			e.kinds[k] = append(e.kinds[k], q)
		}
	}
	return e, nil
}

// Checks lists the metadata of every check the rules define, sorted by id.
func (e *Engine) Checks() []CheckInfo {
	out := make([]CheckInfo, len(e.sorted))
	for i, c := range e.sorted {
		c.Needs = slices.Clone(c.Needs)
		c.Subjects = slices.Clone(c.Subjects)
		out[i] = c
	}
	return out
}

// Kinds lists the subject kinds at least one rule package receives, sorted.
func (e *Engine) Kinds() []string {
	var out []string
	for k := range e.kinds {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}

// sandboxCapabilities is this OPA version's built-ins minus everything that
// reaches the network, the environment or gives a different answer each run:
// user rules must not leak records or make a report unrepeatable.
func sandboxCapabilities() *ast.Capabilities {
	caps := ast.CapabilitiesForThisVersion()
	kept := caps.Builtins[:0]
	for _, b := range caps.Builtins {
		if refusedBuiltin(b) {
			continue
		}
		kept = append(kept, b)
	}
	caps.Builtins = kept
	caps.AllowNet = []string{}
	return caps
}

func refusedBuiltin(b *ast.Builtin) bool {
	return b.Name == "http.send" || b.Name == "opa.runtime" ||
		strings.HasPrefix(b.Name, "net.") || b.Nondeterministic
}

// refusedNames are the built-ins sandboxCapabilities removes, so that an
// "undefined function" error can say why.
var refusedNames = func() map[string]bool {
	m := map[string]bool{}
	for _, b := range ast.CapabilitiesForThisVersion().Builtins {
		if refusedBuiltin(b) {
			m[b.Name] = true
		}
	}
	return m
}()

func newCompiler(caps *ast.Capabilities) *ast.Compiler {
	return ast.NewCompiler().
		WithCapabilities(caps).
		WithStrict(true).
		WithDefaultRegoVersion(ast.RegoV1)
}

// parseSources reads every .rego file of sources. With tests false, files
// ending in _test.rego are skipped; with true they are included.
func parseSources(sources []Source, tests bool) (map[string]*ast.Module, error) {
	modules := map[string]*ast.Module{}
	var problems []string
	opts := ast.ParserOptions{ProcessAnnotation: true, RegoVersion: ast.RegoV1}
	for _, src := range sources {
		if src.FS == nil {
			return nil, fmt.Errorf("rules source %q has no files", src.Name)
		}
		err := fs.WalkDir(src.FS, ".", func(p string, d fs.DirEntry, err error) error {
			if err != nil {
				return err
			}
			if d.IsDir() || !strings.HasSuffix(p, ".rego") {
				return nil
			}
			if strings.HasSuffix(p, "_test.rego") && !tests {
				return nil
			}
			name := p
			if src.Name != "" {
				name = path.Join(src.Name, p)
			}
			if _, dup := modules[name]; dup {
				problems = append(problems, name+": file given twice")
				return nil
			}
			b, err := fs.ReadFile(src.FS, p)
			if err != nil {
				return err
			}
			m, err := ast.ParseModuleWithOpts(name, string(b), opts)
			if err != nil {
				problems = append(problems, formatASTErrors(err)...)
				return nil
			}
			if m == nil {
				problems = append(problems, name+":1:1: empty policy file (no package)")
				return nil
			}
			modules[name] = m
			return nil
		})
		if err != nil {
			return nil, fmt.Errorf("reading rules %s: %w", src.Name, err)
		}
	}
	if len(problems) > 0 {
		return nil, &RulesError{Problems: problems}
	}
	return modules, nil
}

func formatASTErrors(err error) []string {
	var errs ast.Errors
	if !errors.As(err, &errs) {
		return []string{err.Error()}
	}
	out := make([]string, 0, len(errs))
	for _, e := range errs {
		out = append(out, formatASTError(e))
	}
	return out
}

var undefinedFunction = regexp.MustCompile(`undefined function ([A-Za-z0-9_.]+)`)

func formatASTError(e *ast.Error) string {
	msg := e.Message
	if m := undefinedFunction.FindStringSubmatch(msg); m != nil && refusedNames[m[1]] {
		msg = fmt.Sprintf("%s is not allowed in welfare rules: rules run without network, environment or nondeterministic built-ins", m[1])
	}
	if e.Location == nil {
		return msg
	}
	return fmt.Sprintf("%s:%d:%d: %s", e.Location.File, e.Location.Row, e.Location.Col, msg)
}

func compileError(errs ast.Errors) error {
	out := make([]string, 0, len(errs))
	for _, e := range errs {
		out = append(out, formatASTError(e))
	}
	return &RulesError{Problems: out}
}

// rulePackage is one package under welfare that defines findings.
type rulePackage struct {
	name     string
	subjects []string
}

var checkIDPattern = regexp.MustCompile(`^[a-z][a-z0-9_]*(\.[a-z][a-z0-9_]*){1,3}$`)

// readMetadata finds the rule packages and their checks in the compiled
// modules and validates their METADATA.
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

	type pkgState struct {
		firstLoc     *ast.Location // package line of the first file that defines findings
		hasFindings  bool
		subjects     []string
		subjectsLoc  *ast.Location
		subjectsSeen bool
	}
	pkgs := map[string]*pkgState{}
	var order []string
	checks := map[string]CheckInfo{}

	for _, f := range files {
		m := modules[f]
		name := strings.TrimPrefix(m.Package.Path.String(), "data.")
		if !strings.HasPrefix(name, "welfare.") {
			continue
		}
		st := pkgs[name]
		if st == nil {
			st = &pkgState{}
			pkgs[name] = st
			order = append(order, name)
		}
		for _, a := range m.Annotations {
			if a.Scope != "package" {
				continue
			}
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
			if st.subjectsSeen && !slices.Equal(st.subjects, subjects) {
				at(a.Location, "package %s: custom.subjects %v differs from %v given at %s", name, subjects, st.subjects, regoLoc(st.subjectsLoc))
				continue
			}
			st.subjects, st.subjectsLoc, st.subjectsSeen = subjects, a.Location, true
		}
		for _, r := range m.Rules {
			if r.Head.Ref()[0].Value.Compare(ast.Var("findings")) == 0 && !st.hasFindings {
				st.hasFindings = true
				st.firstLoc = m.Package.Location
			}
			for _, a := range r.Annotations {
				if a.Scope != "rule" {
					continue
				}
				info, ok := metaCheck(a, name, f, at)
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
	}

	var out []rulePackage
	for _, name := range order {
		st := pkgs[name]
		if !st.hasFindings {
			continue
		}
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
	if !checkIDPattern.MatchString(id) {
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
		a.Source == b.Source && a.Runs == b.Runs && a.Reportable == b.Reportable && slices.Equal(a.Needs, b.Needs)
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

func regoLoc(l *ast.Location) string {
	if l == nil {
		return "?"
	}
	return fmt.Sprintf("%s:%d:%d", l.File, l.Row, l.Col)
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

// limitsStore holds the limits as data.limits, read-only.
func limitsStore(limits map[string]any) (storage.Store, error) {
	if limits == nil {
		limits = map[string]any{}
	}
	// One JSON round trip turns typed YAML values into plain JSON values
	// the store accepts; it happens once per run, not per evaluation.
	b, err := json.Marshal(map[string]any{"limits": stringKeys(limits)})
	if err != nil {
		return nil, fmt.Errorf("limits: %w", err)
	}
	var data map[string]any
	if err := json.Unmarshal(b, &data); err != nil {
		return nil, fmt.Errorf("limits: %w", err)
	}
	return inmem.NewFromObjectWithOpts(data, inmem.OptRoundTripOnWrite(false), inmem.OptReturnASTValuesOnRead(true)), nil
}

// stringKeys turns YAML maps with non-string keys (a table keyed by wind
// speed, say) into string-keyed maps, as Rego objects read from data are.
func stringKeys(v any) any {
	switch x := v.(type) {
	case map[string]any:
		out := make(map[string]any, len(x))
		for k, e := range x {
			out[k] = stringKeys(e)
		}
		return out
	case map[any]any:
		out := make(map[string]any, len(x))
		for k, e := range x {
			out[fmt.Sprint(k)] = stringKeys(e)
		}
		return out
	case []any:
		out := make([]any, len(x))
		for i, e := range x {
			out[i] = stringKeys(e)
		}
		return out
	}
	return v
}

// Evaluate runs every rule package that receives kind over each input (one
// subject's facts: map[string]any / []any / string / float64 / int / bool),
// in parallel, each evaluation under the time budget. It returns the
// findings of this call, runs collapsed, sorted by domain, check, subject
// and day.
func (e *Engine) Evaluate(ctx context.Context, kind string, inputs []map[string]any) ([]Finding, error) {
	if !slices.Contains(SubjectKinds, kind) {
		return nil, fmt.Errorf("unknown subject kind %q (known: %s)", kind, strings.Join(SubjectKinds, ", "))
	}
	queries := e.kinds[kind]
	if len(queries) == 0 || len(inputs) == 0 {
		return nil, nil
	}

	// On the first failure no new subjects start, but the ones already
	// running finish (each is bounded by the time budget). Subjects start
	// in input order, so every subject before a failing one has run, and
	// the error returned is always the one of the first failing subject,
	// however the workers were scheduled.
	var failed atomic.Bool
	results := make([][]Finding, len(inputs))
	errs := make([]error, len(inputs))
	next := make(chan int)
	var wg sync.WaitGroup
	for range min(e.opt.Workers, len(inputs)) {
		wg.Go(func() {
			for i := range next {
				results[i], errs[i] = e.evaluateOne(ctx, queries, inputs[i])
				if errs[i] != nil {
					failed.Store(true)
				}
			}
		})
	}
	for i := range inputs {
		if failed.Load() || ctx.Err() != nil {
			break
		}
		next <- i
	}
	close(next)
	wg.Wait()

	if err := ctx.Err(); err != nil {
		return nil, err
	}
	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	var all []Finding
	for _, r := range results {
		all = append(all, r...)
	}
	all = collapseRuns(all, e.checks)
	slices.SortStableFunc(all, compareFindings)
	return all, nil
}

func inputSubject(input map[string]any) string {
	if id, ok := input["id"]; ok {
		return fmt.Sprint(id)
	}
	return "(no id)"
}

func (e *Engine) evaluateOne(ctx context.Context, queries []*packageQuery, input map[string]any) ([]Finding, error) {
	subject := inputSubject(input)
	val, err := ast.InterfaceToValue(input)
	if err != nil {
		return nil, fmt.Errorf("subject %s: facts cannot be given to the rules: %w", subject, err)
	}
	var out []Finding
	for _, q := range queries {
		evalCtx, cancel := context.WithTimeout(ctx, e.opt.Timeout)
		rs, err := q.query.Eval(evalCtx, rego.EvalParsedInput(val))
		timedOut := errors.Is(evalCtx.Err(), context.DeadlineExceeded)
		cancel()
		if err != nil {
			switch {
			case ctx.Err() != nil:
				return nil, ctx.Err()
			case timedOut || topdown.IsCancel(err):
				return nil, fmt.Errorf("%s: subject %s: the %s %w (a rule is looping or doing too much work)", q.name, subject, e.opt.Timeout, ErrTimeBudget)
			}
			return nil, fmt.Errorf("%s: subject %s: %w", q.name, subject, err)
		}
		if len(rs) == 0 || len(rs[0].Expressions) == 0 {
			continue
		}
		list, ok := rs[0].Expressions[0].Value.([]any)
		if !ok {
			return nil, fmt.Errorf("%s: subject %s: findings must be a set of objects, got %T", q.name, subject, rs[0].Expressions[0].Value)
		}
		for _, raw := range list {
			f, keep, err := e.toFinding(raw)
			if err != nil {
				return nil, fmt.Errorf("%s: subject %s: finding %s: %w", q.name, subject, compactJSON(raw), err)
			}
			if keep {
				out = append(out, f)
			}
		}
	}
	return out, nil
}

func compactJSON(v any) string {
	b, err := json.Marshal(v)
	if err != nil {
		return fmt.Sprint(v)
	}
	return string(b)
}

var findingKeys = map[string]bool{
	"check": true, "subject": true, "on": true, "until": true,
	"message": true, "evidence": true, "severity": true,
}

// toFinding converts one object of a findings set. keep is false when the
// limits turn the check off.
func (e *Engine) toFinding(raw any) (f Finding, keep bool, err error) {
	obj, ok := raw.(map[string]any)
	if !ok {
		return f, false, errors.New("is not an object")
	}
	for k := range obj {
		if !findingKeys[k] {
			return f, false, fmt.Errorf("unknown field %q (fields: check, subject, on, until, message, evidence, severity)", k)
		}
	}
	str := func(key string, required bool) (string, error) {
		v, has := obj[key]
		if !has {
			if required {
				return "", fmt.Errorf("missing %q", key)
			}
			return "", nil
		}
		s, ok := v.(string)
		if !ok || (required && s == "") {
			return "", fmt.Errorf("%q must be a non-empty string", key)
		}
		return s, nil
	}
	var check, on, until, sev string
	if check, err = str("check", true); err != nil {
		return f, false, err
	}
	info, ok := e.checks[check]
	if !ok {
		return f, false, fmt.Errorf("check %q has no METADATA (title, description, custom.id, custom.severity, custom.source)", check)
	}
	f.Check, f.Domain, f.Title, f.Source = check, info.Domain, info.Title, info.Source
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
		return f, false, fmt.Errorf("on: %w", err)
	}
	if until, err = str("until", false); err != nil {
		return f, false, err
	}
	if until != "" {
		if f.Until, err = records.ParseDay(until); err != nil {
			return f, false, fmt.Errorf("until: %w", err)
		}
		if f.Until < f.On {
			return f, false, fmt.Errorf("until %s is before on %s", until, on)
		}
		if f.Until == f.On {
			f.Until = 0
		}
	}
	ev, has := obj["evidence"]
	if !has {
		return f, false, errors.New(`missing "evidence" (a list of "FILE:LINE", may be empty)`)
	}
	refs, ok := ev.([]any)
	if !ok {
		return f, false, errors.New(`"evidence" must be a list of "FILE:LINE" strings`)
	}
	for _, r := range refs {
		s, ok := r.(string)
		if !ok || s == "" {
			return f, false, errors.New(`"evidence" must be a list of "FILE:LINE" strings`)
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
			return f, false, fmt.Errorf("severity %q is not significant, minor or note", sev)
		}
		f.Severity = Severity(sev)
	}
	if o, has := e.override[check]; has {
		if o == "off" {
			return f, false, nil
		}
		f.Severity = Severity(o)
	}
	return f, true, nil
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

func compareRefs(a, b records.Ref) int {
	fa, la := splitRef(a)
	fb, lb := splitRef(b)
	if c := strings.Compare(fa, fb); c != 0 {
		return c
	}
	if la != lb {
		if la < lb {
			return -1
		}
		return 1
	}
	return strings.Compare(string(a), string(b))
}

func splitRef(r records.Ref) (string, int) {
	s := string(r)
	// FILE:LINE, or a workbook's FILE:SHEET!ROW or FILE:SHEET!CELL (C212).
	i := strings.LastIndexAny(s, ":!")
	if i < 0 {
		return s, -1
	}
	num := strings.TrimLeft(s[i+1:], "ABCDEFGHIJKLMNOPQRSTUVWXYZ")
	n, err := strconv.Atoi(num)
	if err != nil {
		return s, -1
	}
	return s[:i], n
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
