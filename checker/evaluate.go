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

	"github.com/open-policy-agent/opa/v1/ast"
	"github.com/open-policy-agent/opa/v1/rego"
	"github.com/open-policy-agent/opa/v1/topdown"
)

// Evaluate runs every rule package that receives kind over each input (one
// subject's facts: map[string]any / []any / string / float64 / int / bool),
// in parallel, each evaluation under the time budget. It returns the
// findings of this call, runs collapsed, sorted by domain, check, subject
// and day.
func (e *engine) Evaluate(ctx context.Context, kind string, inputs []map[string]any) ([]Finding, error) {
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

func (e *engine) evaluateOne(ctx context.Context, queries []*packageQuery, input map[string]any) ([]Finding, error) {
	subject := inputSubject(input)
	val, err := ast.InterfaceToValue(input)
	if err != nil {
		return nil, fmt.Errorf("subject %s: facts cannot be given to the rules: %w", subject, err)
	}
	var out []Finding
	for _, q := range queries {
		evalCtx, cancel := context.WithTimeout(ctx, e.opt.Timeout)
		rs, err := q.query.Eval(evalCtx, rego.EvalParsedInput(val), rego.EvalTime(pinnedTime))
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
			f, keep, err := e.toFinding(q.name, raw)
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
