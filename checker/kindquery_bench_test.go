package checker

import (
	"context"
	"testing"

	"github.com/open-policy-agent/opa/v1/ast"
	"github.com/open-policy-agent/opa/v1/rego"
)

// BenchmarkOneQueryPerKind compares, on the generated year at 1,000
// animals (documents converted beforehand, one goroutine), the shipped
// rules evaluated with one query per package and subject (packages) and
// with one query per subject for every package of its kind (kind, as
// Evaluate does: kindQuery, findings made Finding values), each package
// under its own time budget in both.
//
//	go test ./checker -run '^$' -bench OneQueryPerKind -benchtime 3x -count 3
func BenchmarkOneQueryPerKind(b *testing.B) {
	lim := defaultLimits(b)
	engine := shippedEngine(b, lim)
	ctx := context.Background()
	set, _ := generatedSet(b, 1000, lim)
	from, to := recordSpan(set)
	f := newFacts(set, lim, Period{From: from, To: to})
	buildFacts(f, nil)
	vals := map[string][]ast.Value{}
	for _, kind := range engine.Kinds() {
		conv := newConverter()
		for _, doc := range f.inputs(kind) {
			v, err := conv.document(doc)
			if err != nil {
				b.Fatal(err)
			}
			vals[kind] = append(vals[kind], v)
		}
	}
	rctx, cancel := engine.startRun(ctx, nil)
	defer cancel()
	run := runOf(rctx)
	w, err := engine.newWorker(rctx)
	if err != nil {
		b.Fatal(err)
	}
	defer w.close()
	eval := func(q rego.PreparedEvalQuery, v ast.Value) {
		call := w.start(DefaultTimeout)
		_, err := q.Eval(rctx, rego.EvalParsedInput(v), evalAtPinnedTime, noMetrics,
			rego.EvalTransaction(w.txn), rego.EvalExternalCancel(call.cancel))
		w.finish(call)
		if err != nil {
			b.Fatal(err)
		}
	}
	b.Run("packages", func(b *testing.B) {
		b.ReportAllocs()
		defer reportCPU(b)()
		for b.Loop() {
			for kind, vs := range vals {
				for _, v := range vs {
					for _, q := range engine.kinds[kind] {
						eval(q.query, v)
					}
				}
			}
		}
	})
	b.Run("kind", func(b *testing.B) {
		b.ReportAllocs()
		defer reportCPU(b)()
		for b.Loop() {
			for kind, vs := range vals {
				g := engine.groups[kind]
				for _, v := range vs {
					if g == nil {
						for _, q := range engine.kinds[kind] {
							eval(q.query, v)
						}
						continue
					}
					if _, done, err := engine.evaluateGroup(rctx, g, w, run, "", v); err != nil || !done {
						b.Fatal(err)
					}
				}
			}
		}
	})
}
