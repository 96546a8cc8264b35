package checker

import "sync"

// domain is one area of the check catalogue: its name (the first part of
// its check ids, what --only selects) and the fact builder that adds its
// sections to the subjects' input documents (facts_<domain>.go).
type domain struct {
	name  string
	facts func(*facts)
	// lane is when and where the builder runs (buildFacts). A builder
	// that reads the care rounds (f.rounds, f.roundIndex; the care index
	// made from them is kept) runs while they are kept, on lane0 or lane1,
	// so a check that keeps only its result can let the rounds — most of
	// a large set's memory — go before the builders that allocate most
	// (afterRounds) add theirs; once they are gone, f.rounds is nil.
	lane lane
}

// lane is when and where a fact builder runs: while the care rounds are
// kept, on one of two goroutines (lane0 on the facts themselves, lane1 on
// a fork; the two take about as long on the generated years), or once
// they are let go (afterRounds), one builder after the other.
type lane int

const (
	lane0 lane = iota
	lane1
	afterRounds
)

// domains is the one catalogue of the shipped domains, in the order reports
// list them: record keeping first, then the animals' daily care and
// housing, the people who handle them, and the season. Each fact builder
// writes only its own sections, so the order they run in does not change
// the facts. A committee's own domain (a rule package with its own check
// ids) needs no entry: it reads the facts the shipped domains compute, and
// reports list it after these.
//
// The builders not reading the rounds that allocate little (heat,
// protocol, ...) run on lane0 too: the rounds' builders on lane1 take
// longer. Those that allocate most (enclosure, handling, health: 51 MiB of
// the 10,000-animal year) run after: while the rounds are kept the
// collector waits (cmd/welfare/memory.go), so all they allocate then adds
// to the check's peak, and run on two lanes after the rounds go they took
// as long (the collection a check starts then has the other core) and the
// peak was 30 MB more.
var domains = []domain{
	{"records", (*facts).recordsFacts, lane0},
	{"care", func(f *facts) { f.careFacts(); f.cleaningFacts() }, lane0},
	{"enclosure", (*facts).enclosureFacts, afterRounds},
	{"handling", (*facts).handlingFacts, afterRounds},
	{"staff", (*facts).staffFacts, lane1},
	{"ppe", (*facts).ppeFacts, lane0},
	{"protocol", (*facts).protocolFacts, lane0},
	{"cull", (*facts).cullFacts, lane0},
	{"health", (*facts).healthFacts, afterRounds},
	{"litter", (*facts).litterFacts, lane0},
	{"cold", (*facts).coldFacts, lane1},
	{"heat", (*facts).heatFacts, lane0},
	{"environment", (*facts).environmentFacts, lane0},
}

// buildFacts runs every domain's fact builder, by lane; release, when not
// nil, is called once the care rounds are no longer read.
func buildFacts(f *facts, release func()) { buildFactsIn(f, release, 2) }

// buildFactsIn is buildFacts with the builders of lane0 and lane1 run on
// that many goroutines (1: one after the other, in the catalogue's order).
// Each builder writes only its own sections, so neither the order nor the
// lanes change the facts.
func buildFactsIn(f *facts, release func(), lanes int) {
	// What the builders share and make on first use is made before they
	// run side by side: the one pass over the rounds (with the care index)
	// and the period's days as OPA values.
	f.roundIndex()
	f.days.makeTerms()
	var early, rest []domain
	for _, d := range domains {
		if d.lane == afterRounds {
			rest = append(rest, d)
		} else {
			early = append(early, d)
		}
	}
	f.buildLanes(early, lanes)
	f.rounds, f.rix = nil, nil
	if release != nil {
		release()
	}
	for _, d := range rest {
		d.facts(f)
	}
}

// buildLanes runs the builders ds, lane0's on f, lane1's on a goroutine
// of its own writing into a fork of f (fork), which joins f once both are
// done (join). With one lane they run one after the other on f.
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
			if d.lane == lane1 {
				d.facts(g)
			}
		}
	})
	for _, d := range ds {
		if d.lane != lane1 {
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
