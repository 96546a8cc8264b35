package checker

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
}

// domains is the one catalogue of the shipped domains, in the order reports
// list them: record keeping first, then the animals' daily care and
// housing, the people who handle them, and the season. The fact builders
// run in this order; each writes only its own sections, so the order does
// not change the facts. A committee's own domain (a rule package with its
// own check ids) needs no entry: it reads the facts the shipped domains
// compute, and reports list it after these.
var domains = []domain{
	{"records", (*facts).recordsFacts, true},
	{"care", func(f *facts) { f.careFacts(); f.cleaningFacts() }, true},
	{"enclosure", (*facts).enclosureFacts, false},
	{"handling", (*facts).handlingFacts, false},
	{"staff", (*facts).staffFacts, true},
	{"ppe", (*facts).ppeFacts, false},
	{"protocol", (*facts).protocolFacts, false},
	{"cull", (*facts).cullFacts, false},
	{"health", (*facts).healthFacts, false},
	{"litter", (*facts).litterFacts, false},
	{"cold", (*facts).coldFacts, true},
	{"heat", (*facts).heatFacts, false},
	{"environment", (*facts).environmentFacts, false},
}

// buildFacts runs every domain's fact builder, the ones reading the care
// rounds first; release, when not nil, is called once those are done.
// Each builder writes only its own sections, so the order does not change
// the facts.
func buildFacts(f *facts, release func()) {
	for _, d := range domains {
		if d.rounds {
			d.facts(f)
		}
	}
	f.rounds, f.rix = nil, nil
	if release != nil {
		release()
	}
	for _, d := range domains {
		if !d.rounds {
			d.facts(f)
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
