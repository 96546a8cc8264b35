package checker

import "sync"

// domain is one area of the check catalogue: its name (the first part of
// its check ids, what --only selects) and the fact builder that adds its
// sections to the subjects' input documents (facts_<domain>.go).
type domain struct {
	name  string
	facts func(*facts)
	// rounds: the builder reads the care rounds themselves (f.rounds; the
	// care index made from them is kept). Such builders run first, so a
	// check that keeps only its result can let the rounds — most of a
	// large set's memory — go before the other builders add theirs.
	rounds bool
	// lane, for a builder reading the rounds, is the goroutine it runs on
	// (buildLanes): 0 on the facts themselves, 1 on a fork, picked so the
	// lanes take about as long on the generated years.
	lane int
}

// domains is the one catalogue of the shipped domains, in the order reports
// list them: record keeping first, then the animals' daily care and
// housing, the people who handle them, and the season. The fact builders
// run in this order; each writes only its own sections, so the order does
// not change the facts. A committee's own domain (a rule package with its
// own check ids) needs no entry: it reads the facts the shipped domains
// compute, and reports list it after these.
var domains = []domain{
	{"records", (*facts).recordsFacts, true, 0},
	{"care", func(f *facts) { f.careFacts(); f.cleaningFacts() }, true, 0},
	{"enclosure", (*facts).enclosureFacts, false, 0},
	{"handling", (*facts).handlingFacts, false, 0},
	{"staff", (*facts).staffFacts, true, 1},
	{"ppe", (*facts).ppeFacts, false, 0},
	{"protocol", (*facts).protocolFacts, false, 0},
	{"cull", (*facts).cullFacts, false, 0},
	{"health", (*facts).healthFacts, false, 0},
	{"litter", (*facts).litterFacts, false, 0},
	{"cold", (*facts).coldFacts, true, 1},
	{"heat", (*facts).heatFacts, false, 0},
	{"environment", (*facts).environmentFacts, false, 0},
}

// buildFacts runs every domain's fact builder: the ones reading the care
// rounds first, on two goroutines by lane (buildLanes); release, when not
// nil, is called once those are done, and the others run after, one after
// the other.
func buildFacts(f *facts, release func()) { buildFactsIn(f, release, 2) }

// buildFactsIn is buildFacts with the builders reading the care rounds run
// on that many goroutines (1: one after the other, in the catalogue's
// order). Each builder writes only its own sections, so neither the order
// nor the lanes change the facts.
func buildFactsIn(f *facts, release func(), lanes int) {
	// What the builders share and make on first use is made before they
	// run side by side: the one pass over the rounds (with the care index)
	// and the period's days as OPA values.
	f.roundIndex()
	f.days.makeTerms()
	var round, rest []domain
	for _, d := range domains {
		if d.rounds {
			round = append(round, d)
		} else {
			rest = append(rest, d)
		}
	}
	f.buildLanes(round, lanes)
	f.rounds, f.rix = nil, nil
	if release != nil {
		release()
	}
	// The others run one after the other: on two lanes they took as long
	// on the generated year of 10,000 animals (the collection a check
	// starts as the rounds go has the other core then) and it held 30 MB
	// more at its peak; while the rounds are kept, the collector waits
	// (cmd/welfare/memory.go), so run then, they held 40 MB more.
	for _, d := range rest {
		d.facts(f)
	}
}

// buildLanes runs the builders ds, lane 0 on f, lane 1 on a goroutine of
// its own writing into a fork of f (fork), whose documents join f's once
// both are done (join). With one lane they run one after the other on f.
func (f *facts) buildLanes(ds []domain, lanes int) {
	if lanes < 2 {
		for _, d := range ds {
			d.facts(f)
		}
		return
	}
	g := f.fork()
	var wg sync.WaitGroup
	wg.Go(func() {
		for _, d := range ds {
			if d.lane == 1 {
				d.facts(g)
			}
		}
	})
	for _, d := range ds {
		if d.lane != 1 {
			d.facts(f)
		}
	}
	wg.Wait()
	f.join(g)
}

// fork is a facts sharing f's records and indexes, to build facts at the
// same time as f: it has documents and report figures of its own, empty,
// and writes into them only. Its builders must not make what f makes on
// first use (buildFactsIn makes it before).
func (f *facts) fork() *facts {
	g := *f
	g.docs = map[string]map[string]map[string]any{}
	g.coverage, g.weather = CareCoverage{}, nil
	g.forked = true
	return &g
}

// join adds what g built to f: its report figures (the care coverage
// counts, the weather sites' days), and its documents: a subject's
// document f has not is taken as it is; to one it has, g's sections are
// added. The keys both documents have are those every builder writing a
// subject's document gives it alike (its kind, id, name and ref; an
// animal's record-keeping attributes, animalDoc), and f's stay.
func (f *facts) join(g *facts) {
	f.coverage.OccupiedDays += g.coverage.OccupiedDays
	f.coverage.CompleteDays += g.coverage.CompleteDays
	f.weather = append(f.weather, g.weather...)
	for kind, byID := range g.docs {
		for id, gd := range byID {
			fd := f.docs[kind][id]
			if fd == nil {
				if f.docs[kind] == nil {
					f.docs[kind] = map[string]map[string]any{}
				}
				f.docs[kind][id] = gd
				continue
			}
			for k, v := range gd {
				if _, ok := fd[k]; !ok {
					fd[k] = v
				}
			}
		}
	}
}

// Domains lists the shipped domains in report order.
func Domains() []string {
	out := make([]string, len(domains))
	for i, d := range domains {
		out[i] = d.name
	}
	return out
}
