package checker

import (
	"context"
	"fmt"
	"testing"

	"github.com/open-policy-agent/opa/v1/ast"
	"github.com/open-policy-agent/opa/v1/rego"
)

// BenchmarkPackages times each shipped rule package on its own, per subject
// kind, on a generated folder (welfare generate --days 365 --seed 7): one op
// is one package's prepared query evaluated on every subject of the kind, in
// one goroutine, on documents converted beforehand, so the time is the
// rules' own (cpu-ns/op is the CPU time, steadier on a shared machine). The conversion of each kind's documents is timed apart
// (convert). It names where the rules' time goes, e.g.
//
//	go test ./checker -run '^$' -bench 'Packages/animals=1000/' -benchtime 3x -count 3
func BenchmarkPackages(b *testing.B) {
	lim := defaultLimits(b)
	engine := shippedEngine(b, lim)
	ctx := context.Background()
	for _, n := range []int{1000, 10000} {
		b.Run(fmt.Sprintf("animals=%d", n), func(b *testing.B) {
			set, _ := generatedSet(b, n, lim)
			from, to := recordSpan(set)
			f := newFacts(set, lim, Period{From: from, To: to})
			for _, d := range domains {
				d.facts(f)
			}
			for _, kind := range engine.Kinds() {
				docs := f.inputs(kind)
				if len(docs) == 0 {
					continue
				}
				b.Run(kind+"/convert", func(b *testing.B) {
					b.ReportAllocs()
					defer reportCPU(b)()
					for b.Loop() {
						conv := newConverter()
						for _, doc := range docs {
							if _, err := conv.document(doc); err != nil {
								b.Fatal(err)
							}
						}
					}
				})
				conv := newConverter()
				vals := make([]ast.Value, len(docs))
				for i, doc := range docs {
					var err error
					if vals[i], err = conv.document(doc); err != nil {
						b.Fatal(err)
					}
				}
				for _, q := range engine.kinds[kind] {
					b.Run(kind+"/"+q.name, func(b *testing.B) {
						b.ReportAllocs()
						defer reportCPU(b)()
						var found int
						for b.Loop() {
							found = 0
							for _, v := range vals {
								rs, err := q.query.Eval(ctx, rego.EvalParsedInput(v), rego.EvalTime(pinnedTime))
								if err != nil {
									b.Fatal(err)
								}
								if len(rs) > 0 && len(rs[0].Expressions) > 0 {
									list, _ := rs[0].Expressions[0].Value.([]any)
									found += len(list)
								}
							}
						}
						b.ReportMetric(float64(found), "findings")
					})
				}
			}
		})
	}
}
