package checker

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"slices"
	"strings"
	"sync"
	"sync/atomic"
	"time"
	"unicode/utf8"

	"github.com/open-policy-agent/opa/v1/ast"
	"github.com/open-policy-agent/opa/v1/metrics"
	"github.com/open-policy-agent/opa/v1/rego"
	"github.com/open-policy-agent/opa/v1/storage"
	"github.com/open-policy-agent/opa/v1/topdown"
	"github.com/open-policy-agent/opa/v1/topdown/print"

	"welfare/records"
)

// Evaluate runs every rule package that receives kind over each input (one
// subject's facts: map[string]any / []any / string / float64 / int / bool),
// in parallel, each evaluation under the time budgets (Options). It
// returns the findings of this call, runs collapsed, sorted by domain,
// check, subject and day. A finding a rule got wrong (a field of the wrong
// type, a bad date, an unknown severity, a check id not of its package, an
// evidence ref naming no record row) does not stop the rest: it becomes a
// MalformedCheck finding naming the rule and the field.
func (e *engine) Evaluate(ctx context.Context, kind string, inputs []map[string]any) ([]Finding, error) {
	if !slices.Contains(SubjectKinds, kind) {
		return nil, fmt.Errorf("unknown subject kind %q (known: %s)", kind, strings.Join(SubjectKinds, ", "))
	}
	queries := e.kinds[kind]
	if len(queries) == 0 || len(inputs) == 0 {
		return nil, nil
	}
	if runOf(ctx) == nil {
		ctx = e.withRun(ctx, nil)
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
			w, err := e.newWorker(ctx)
			if err != nil {
				// No subject is taken, so the first one's error is
				// this one.
				for i := range next {
					errs[i] = err
					failed.Store(true)
				}
				return
			}
			defer w.close()
			for i := range next {
				results[i], errs[i] = e.evaluateOne(ctx, queries, e.groups[kind], w, inputs[i])
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

	for _, err := range errs {
		if err != nil {
			return nil, err
		}
	}
	if ctx.Err() != nil {
		return nil, e.stopped(ctx, kind+" subjects", "")
	}
	var all []Finding
	for _, r := range results {
		all = append(all, r...)
	}
	all = collapseRuns(all, e.checks)
	slices.SortStableFunc(all, compareFindings)
	return all, nil
}

// errTotalBudget is the cause of a check's evaluation context ending when
// the whole evaluation ran out of its budget.
var errTotalBudget = errors.New("the whole evaluation's time budget ran out")

// evalRun is the state one check's evaluation shares across its Evaluate
// calls (through the context): the time each package has spent, and the
// record files read with their line counts, for evidence refs.
type evalRun struct {
	// spent is the evaluation time of each package (by
	// packageQuery.index), in nanoseconds.
	spent []atomic.Int64
	// lines has, per record file read, its number of lines; nil when the
	// rows did not come from files (hand-made sets in tests), and evidence
	// refs are then not compared with files.
	lines map[string]int
}

type runKey struct{}

// startRun is the context of one check's evaluation: the whole
// evaluation's budget, and the run state its Evaluate calls share.
func (e *engine) startRun(ctx context.Context, lines map[string]int) (context.Context, context.CancelFunc) {
	ctx, cancel := context.WithTimeoutCause(ctx, e.opt.TotalBudget, errTotalBudget)
	return e.withRun(ctx, lines), cancel
}

func (e *engine) withRun(ctx context.Context, lines map[string]int) context.Context {
	return context.WithValue(ctx, runKey{}, &evalRun{spent: make([]atomic.Int64, e.packages), lines: lines})
}

func runOf(ctx context.Context) *evalRun {
	r, _ := ctx.Value(runKey{}).(*evalRun)
	return r
}

func (r *evalRun) spentOn(q *packageQuery) time.Duration {
	return time.Duration(r.spent[q.index].Load())
}

func (r *evalRun) add(q *packageQuery, d time.Duration) {
	r.spent[q.index].Add(int64(d))
}

// evalWorker is what one worker of Evaluate keeps across its subjects:
// its converter, one read transaction on the limits' store for all its
// evaluations (the store is never written while rules run), and the
// cancellation of the evaluation it is running.
//
// Each evaluation gets a topdown.Cancel of its own, cancelled by a timer
// when its time budget runs out, or when the check's context ends (a
// single context.AfterFunc per worker, instead of a context with a timeout
// and a goroutine watching it per evaluation).
type evalWorker struct {
	conv    *converter
	txn     storage.Transaction
	store   storage.Store
	ctx     context.Context
	stop    func() bool
	current atomic.Pointer[evalCall]
	// group is the state of the kindQuery evaluation running (gcall),
	// read by the marks (Print); nil when none is.
	group *groupCall
	gcall groupCall
}

// groupCall is one evaluation of a kindQuery on one subject: which of its
// packages is being evaluated, since when, and under which budget.
type groupCall struct {
	e     *engine
	g     *kindQuery
	run   *evalRun
	call  *evalCall
	phase int // the index in g.pkgs of the package being evaluated
	since time.Time
	// limited: the package's time budget is what is left of its package
	// budget; outOfBudget: that was nothing when its turn came.
	limited, outOfBudget bool
	// spent is the time charged to each package so far.
	spent []time.Duration
}

// evalCall is one running evaluation: its cancel, and whether its timer
// cancelled it.
type evalCall struct {
	cancel   topdown.Cancel
	timedOut atomic.Bool
	timer    *time.Timer
}

func (e *engine) newWorker(ctx context.Context) (*evalWorker, error) {
	txn, err := e.store.NewTransaction(ctx)
	if err != nil {
		return nil, fmt.Errorf("reading the limits: %w", err)
	}
	w := &evalWorker{conv: newConverter(), txn: txn, store: e.store, ctx: ctx}
	w.stop = context.AfterFunc(ctx, func() {
		if c := w.current.Load(); c != nil {
			c.cancel.Cancel()
		}
	})
	return w, nil
}

func (w *evalWorker) close() {
	w.stop()
	w.store.Abort(w.ctx, w.txn)
}

// start makes the cancellation of an evaluation limited to limit.
func (w *evalWorker) start(limit time.Duration) *evalCall {
	c := &evalCall{cancel: topdown.NewCancel()}
	w.current.Store(c)
	// The context may have ended before c was current, its AfterFunc
	// finding the previous evaluation (or none).
	if w.ctx.Err() != nil {
		c.cancel.Cancel()
	}
	c.timer = time.AfterFunc(limit, func() {
		c.timedOut.Store(true)
		c.cancel.Cancel()
	})
	return c
}

// finish ends an evaluation's cancellation; it reports whether the
// evaluation's time budget ran out.
func (w *evalWorker) finish(c *evalCall) bool {
	c.timer.Stop()
	w.current.Store(nil)
	return c.timedOut.Load()
}

// noMetrics: the rules' evaluations are not measured by OPA (it would
// otherwise make a set of metrics, and read the clock, per evaluation).
var noMetrics = rego.EvalMetrics(metrics.NoOp())

var evalAtPinnedTime = rego.EvalTime(pinnedTime)

// stopped is the error of an evaluation whose context ended while running
// what (a package) on subject: the whole evaluation's budget, named with
// where it ran out, or the caller's cancellation (Ctrl-C) as it is.
func (e *engine) stopped(ctx context.Context, what, subject string) error {
	if errors.Is(context.Cause(ctx), errTotalBudget) {
		if subject != "" {
			what += ": subject " + subject
		}
		return fmt.Errorf("%s: the %s %w for the whole evaluation (every package and subject; a rule is looping or doing too much work)",
			what, e.opt.TotalBudget, ErrTimeBudget)
	}
	return ctx.Err()
}

func inputSubject(input map[string]any) string {
	if id, ok := input["id"]; ok {
		return fmt.Sprint(id)
	}
	return "(no id)"
}

// limitOf is the time budget of q's evaluation on one subject: the smaller
// of a subject's own budget and what is left of its package's (limited).
func (e *engine) limitOf(run *evalRun, q *packageQuery) (limit time.Duration, limited bool) {
	limit = e.opt.Timeout
	if left := e.opt.PackageBudget - run.spentOn(q); left < limit {
		return left, true
	}
	return limit, false
}

func (e *engine) evaluateOne(ctx context.Context, queries []*packageQuery, group *kindQuery, w *evalWorker, input map[string]any) ([]Finding, error) {
	subject := inputSubject(input)
	val, err := w.conv.document(input)
	if err != nil {
		return nil, fmt.Errorf("subject %s: facts cannot be given to the rules: %w", subject, err)
	}
	run := runOf(ctx)
	if group != nil {
		if out, done, err := e.evaluateGroup(ctx, group, w, run, subject, val); done {
			return out, err
		}
	}
	return e.evaluatePackages(ctx, queries, w, run, subject, val)
}

// evaluatePackages evaluates each package of queries on one subject, one
// evaluation per package.
func (e *engine) evaluatePackages(ctx context.Context, queries []*packageQuery, w *evalWorker, run *evalRun, subject string, val ast.Value) ([]Finding, error) {
	var out []Finding
	for _, q := range queries {
		limit, packageLimited := e.limitOf(run, q)
		if limit <= 0 {
			return nil, e.packageBudgetErr(q.name, subject)
		}
		call := w.start(limit)
		started := time.Now()
		rs, err := q.query.Eval(ctx, rego.EvalParsedInput(val), evalAtPinnedTime, noMetrics,
			rego.EvalTransaction(w.txn), rego.EvalExternalCancel(call.cancel))
		run.add(q, time.Since(started))
		timedOut := w.finish(call)
		if err != nil {
			switch {
			case ctx.Err() != nil:
				return nil, e.stopped(ctx, q.name, subject)
			case (timedOut || topdown.IsCancel(err)) && packageLimited:
				return nil, e.packageBudgetErr(q.name, subject)
			case timedOut || topdown.IsCancel(err):
				return nil, e.timedOutErr(q.name, subject)
			}
			return nil, fmt.Errorf("%s: subject %s: %w", q.name, subject, err)
		}
		if len(rs) == 0 || len(rs[0].Expressions) == 0 {
			continue
		}
		if out, err = e.appendFindings(out, q.name, subject, rs[0].Expressions[0].Value, run); err != nil {
			return nil, err
		}
	}
	return out, nil
}

// appendFindings appends the findings of package pkg's findings set v on
// one subject to out: a finding the rule got wrong as a malformed-rule
// finding, a value that is not a set of objects as the error.
func (e *engine) appendFindings(out []Finding, pkg, subject string, v any, run *evalRun) ([]Finding, error) {
	list, ok := v.([]any)
	if !ok {
		return nil, fmt.Errorf("%s: subject %s: findings must be a set of objects, got %T", pkg, subject, v)
	}
	for _, raw := range list {
		f, keep, err := e.toFinding(pkg, raw, run.lines)
		if err != nil {
			out = append(out, e.malformed(pkg, subject, raw, err))
			continue
		}
		if keep {
			out = append(out, f)
		}
	}
	return out, nil
}

// timedOutErr is the error of a package that ran out of its per-subject
// budget on subject.
func (e *engine) timedOutErr(pkg, subject string) error {
	return fmt.Errorf("%s: subject %s: the %s %w (a rule is looping or doing too much work)", pkg, subject, e.opt.Timeout, ErrTimeBudget)
}

// evaluateGroup evaluates every package of g on one subject in one
// evaluation, each package under its own time budget (evalWorker.Print).
// It gives what evaluating them one after the other gives: the same
// findings in the same order, the same error. When an error is not one it
// can name the package of by itself, it gives up (done false), its time
// taken back from the packages' budgets: the caller evaluates the
// packages one by one to report the error as it always has. (A built-in's
// error under strict built-in errors does not end the evaluation where it
// happens: OPA gives the first one at the end.)
func (e *engine) evaluateGroup(ctx context.Context, g *kindQuery, w *evalWorker, run *evalRun, subject string, val ast.Value) (out []Finding, done bool, err error) {
	first := g.pkgs[0]
	limit, limited := e.limitOf(run, first)
	if limit <= 0 {
		return nil, true, e.packageBudgetErr(first.name, subject)
	}
	gc := &w.gcall
	*gc = groupCall{e: e, g: g, run: run, call: w.start(limit), since: time.Now(), limited: limited, spent: gc.spent[:0]}
	w.group = gc
	rs, err := g.query.Eval(ctx, rego.EvalParsedInput(val), evalAtPinnedTime, noMetrics,
		rego.EvalTransaction(w.txn), rego.EvalExternalCancel(gc.call.cancel), rego.EvalPrintHook(w))
	w.group = nil
	gc.charge(time.Now())
	q := g.pkgs[gc.phase]
	timedOut := w.finish(gc.call)
	if err != nil {
		stoppedHere := errors.Is(err, errGroupStop) || topdown.IsCancel(err)
		switch {
		case ctx.Err() != nil:
			return nil, true, e.stopped(ctx, q.name, subject)
		case stoppedHere && gc.outOfBudget:
			return nil, true, e.packageBudgetErr(q.name, subject)
		case stoppedHere && timedOut && gc.limited:
			return nil, true, e.packageBudgetErr(q.name, subject)
		case stoppedHere && timedOut:
			return nil, true, e.timedOutErr(q.name, subject)
		}
		for i, d := range gc.spent {
			run.add(g.pkgs[i], -d)
		}
		return nil, false, nil
	}
	if len(rs) != 1 || gc.phase != len(g.pkgs)-1 {
		// Every package's findings is a set, always defined
		// (prepareGroup), and every mark was passed.
		return nil, true, fmt.Errorf("subject %s: the query of its packages gave %d results, at package %s", subject, len(rs), q.name)
	}
	for i, q := range g.pkgs {
		if out, err = e.appendFindings(out, q.name, subject, rs[0].Bindings[g.vars[i]], run); err != nil {
			return nil, true, err
		}
	}
	return out, true, nil
}

// charge charges the time of the package being evaluated, up to now, to
// its package budget.
func (gc *groupCall) charge(now time.Time) {
	d := now.Sub(gc.since)
	gc.run.add(gc.g.pkgs[gc.phase], d)
	gc.spent = append(gc.spent, d)
	gc.since = now
}

// errGroupStop ends a kindQuery evaluation at a mark: the package whose
// turn it is has no time left, or the one before ran out of its own.
var errGroupStop = errors.New("evaluation stopped between packages")

// Print is the hook of the marks of a kindQuery evaluation: the package
// before the mark is done, its time is charged to its package budget, and
// the next package's time budget starts. Only the query's own marks count
// (a print call of a rule has the rule's file as location, and is erased
// from the rules when they are compiled anyway).
func (w *evalWorker) Print(pctx print.Context, _ string) error {
	gc := w.group
	if gc == nil || pctx.Location == nil || pctx.Location.File != "" ||
		gc.phase+1 >= len(gc.g.pkgs) || pctx.Location.Col != gc.g.marks[gc.phase+1] {
		return nil
	}
	if !gc.call.timer.Stop() {
		// The budget of the package before ran out as it finished: it is
		// the one that timed out (the timer has cancelled the evaluation).
		return topdown.Halt{Err: errGroupStop}
	}
	gc.charge(time.Now())
	gc.phase++
	limit, limited := gc.e.limitOf(gc.run, gc.g.pkgs[gc.phase])
	if limit <= 0 {
		gc.outOfBudget = true
		return topdown.Halt{Err: errGroupStop}
	}
	gc.limited = limited
	gc.call.timer.Reset(limit)
	return nil
}

func (e *engine) packageBudgetErr(pkg, subject string) error {
	return fmt.Errorf("%s: the %s %w for the whole package, across its subjects (it ran out at subject %s; a rule is looping or doing too much work)",
		pkg, e.opt.PackageBudget, ErrTimeBudget, subject)
}

// MalformedCheck is the check id of a finding a rule got wrong: the rule's
// output could not be reported as it was, so the run says where and why
// instead of dropping it or stopping.
const MalformedCheck = "rules.finding.malformed"

// malformedInfo is the catalogue entry of MalformedCheck; a result lists it
// among its checks when it has such findings.
var malformedInfo = CheckInfo{
	ID: MalformedCheck, Domain: "rules", Title: "Finding a rule got wrong",
	Description: "A rule produced a finding that could not be reported (a field of the wrong type, a bad date, " +
		"an unknown severity, a check id not of its package, an evidence ref naming no record row): what it judged is unknown until the rule is fixed.",
	Severity: Significant, Source: "welfare rule contract (checker/doc.go)", Package: "(checker)",
}

// malformed turns a finding the rule got wrong into a MalformedCheck
// finding naming the rule's file and row and the offending field. The
// rule is the one of its check (else of its package) whose literal fields
// agree with the finding; when several could have made it, all are named.
func (e *engine) malformed(pkg, subject string, raw any, err error) Finding {
	candidates := e.packageRules[pkg]
	if obj, ok := raw.(map[string]any); ok {
		if id, ok := obj["check"].(string); ok {
			if c, known := e.checks[id]; known && c.Package == pkg && len(e.ruleAt[id]) > 0 {
				candidates = e.ruleAt[id]
			}
		}
	}
	// The rules whose literal fields agree with the finding, when any do.
	var rs, all []string
	for _, c := range candidates {
		all = append(all, c.at)
		if c.matches(raw) {
			rs = append(rs, c.at)
		}
	}
	if len(rs) == 0 {
		rs = all
	}
	where := pkg
	if len(rs) == 1 {
		where = rs[0]
	} else if len(rs) > 1 {
		where = strings.Join(rs, ", ") + " (one of these findings rules)"
	}
	return Finding{
		Check: MalformedCheck, Domain: malformedInfo.Domain, Subject: subject, Severity: Significant,
		Message: fmt.Sprintf("%s: %s gave a finding that was not reported: %v; the finding: %s",
			where, pkg, err, shorten(compactJSON(raw), 300)),
		Evidence: []records.Ref{}, Title: malformedInfo.Title, Source: malformedInfo.Source,
	}
}

// shorten cuts s to at most n bytes (at a rune boundary), saying so.
func shorten(s string, n int) string {
	if len(s) <= n {
		return s
	}
	cut := n
	for cut > 0 && !utf8.RuneStart(s[cut]) {
		cut--
	}
	return fmt.Sprintf("%s… (%d bytes)", s[:cut], len(s))
}

func compactJSON(v any) string {
	b, err := json.Marshal(v)
	if err != nil {
		return fmt.Sprint(v)
	}
	return string(b)
}
