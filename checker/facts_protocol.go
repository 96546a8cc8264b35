package checker

import (
	"sort"

	"welfare/records"
)

// maxOverRefs caps the evidence of protocol.animals.exceeded: the message
// gives the full count, and a report does not need a thousand row numbers.
const maxOverRefs = 10

// protocolDay is what happened under one protocol on one day.
type protocolDay struct {
	day      records.Day
	refs     []records.Ref
	purposes map[string][]any // handling purpose -> refs
	methods  map[string][]any // cull method -> refs
	species  map[string][]any // species of the animal -> refs
	staff    map[string][]any // handler or cull operator -> refs
}

// protocolFacts adds every protocol's "protocol" section: its approval, the
// days of the period with handlings or culls under it (the row's protocol,
// else the animal's) and whether each fell inside the approval, and the
// cumulative count of animals held under it.
//
// "Held under" a protocol: an animal whose animals.csv protocol_id names it
// counts from the first day its stay at the facility (arrived_on to
// left_on) overlaps the approval; an animal handled or culled on a row
// naming the protocol counts from that row's day, if inside the approval.
// The count is cumulative, as a protocol counts animals used: an animal
// that leaves still counts.
func (f *facts) protocolFacts() {
	if len(f.set.Protocols) == 0 {
		return
	}
	byDay := map[string]map[records.Day]*protocolDay{}
	// start[protocol][animal] is the first day the animal counts.
	start := map[string]map[string]records.Day{}
	count := func(pid string, a *records.Animal, d records.Day) {
		p := f.protocols[pid]
		if p == nil || d < p.ApprovedOn || d > p.ExpiresOn {
			return
		}
		m := start[pid]
		if m == nil {
			m = map[string]records.Day{}
			start[pid] = m
		}
		if s, ok := m[a.ID]; !ok || d < s {
			m[a.ID] = d
		}
	}
	event := func(rowPID string, a *records.Animal, d records.Day, ref records.Ref, purpose, method, staff string) {
		pid := rowPID
		if pid == "" {
			pid = a.ProtocolID
		}
		if pid == "" || f.protocols[pid] == nil {
			return
		}
		if rowPID != "" {
			count(pid, a, d)
		}
		if !f.inPeriod(d) {
			return
		}
		m := byDay[pid]
		if m == nil {
			m = map[records.Day]*protocolDay{}
			byDay[pid] = m
		}
		pd := m[d]
		if pd == nil {
			pd = &protocolDay{day: d, purposes: map[string][]any{}, methods: map[string][]any{},
				species: map[string][]any{}, staff: map[string][]any{}}
			m[d] = pd
		}
		pd.refs = append(pd.refs, ref)
		if purpose != "" {
			pd.purposes[purpose] = append(pd.purposes[purpose], string(ref))
		}
		if method != "" {
			pd.methods[method] = append(pd.methods[method], string(ref))
		}
		pd.species[a.Species] = append(pd.species[a.Species], string(ref))
		if staff != "" {
			pd.staff[staff] = append(pd.staff[staff], string(ref))
		}
	}
	for i := range f.set.Animals {
		a := &f.set.Animals[i]
		p := f.protocols[a.ProtocolID]
		if p == nil {
			continue
		}
		from := max(a.ArrivedOn, p.ApprovedOn)
		if a.LeftOn.IsZero() || a.LeftOn >= from {
			count(p.ID, a, from)
		}
	}
	for i := range f.set.Handling {
		h := &f.set.Handling[i]
		if a := f.animals[h.AnimalID]; a != nil {
			event(h.ProtocolID, a, records.DayOf(h.At), h.Ref, h.Purpose, "", h.StaffID)
		}
	}
	for i := range f.set.Culls {
		c := &f.set.Culls[i]
		if a := f.animals[c.AnimalID]; a != nil {
			event(c.ProtocolID, a, records.DayOf(c.At), c.Ref, "", c.Method, c.StaffID)
		}
	}

	for i := range f.set.Protocols {
		p := &f.set.Protocols[i]
		days := make([]*protocolDay, 0, len(byDay[p.ID]))
		for _, pd := range byDay[p.ID] {
			days = append(days, pd)
		}
		sort.Slice(days, func(i, j int) bool { return days[i].day < days[j].day })
		events := make([]any, 0, len(days))
		for _, pd := range days {
			events = append(events, map[string]any{
				"on":       pd.day.String(),
				"in_force": p.ApprovedOn <= pd.day && pd.day <= p.ExpiresOn,
				"refs":     refs(pd.refs...),
				"purposes": anyMap(pd.purposes),
				"methods":  anyMap(pd.methods),
				"species":  anyMap(pd.species),
				"staff":    anyMap(pd.staff),
			})
		}
		var maxAnimals any
		if p.MaxAnimals != nil {
			maxAnimals = *p.MaxAnimals
		}
		d := f.doc("protocol", p.ID)
		d["protocol"] = map[string]any{
			"approved_on":             p.ApprovedOn.String(),
			"expires_on":              p.ExpiresOn.String(),
			"expires_after_period_by": int(p.ExpiresOn - f.period.To),
			"max_animals":             maxAnimals,
			"procedures":              strs(p.Procedures),
			"euthanasia_methods":      strs(p.EuthanasiaMethods),
			"species":                 strs(p.Species),
			"personnel":               strs(p.Personnel),
			"last_reviewed_on":        dayOrNull(p.LastReviewedOn),
			"pain_category":           nilIfEmpty(p.PainCategory),
			"days":                    events,
			"animals":                 f.heldUnder(p, start[p.ID]),
		}
	}
}

// heldUnder counts the animals held under p up to the end of the period (or
// of the approval, if sooner) and finds the first day the count went over
// p's max_animals. That day may precede the period: the excess persists
// while the approval runs, so it is reported as long as the approval
// reaches into the period.
func (f *facts) heldUnder(p *records.Protocol, start map[string]records.Day) map[string]any {
	type held struct {
		a   *records.Animal
		day records.Day
	}
	end := min(p.ExpiresOn, f.period.To)
	list := make([]held, 0, len(start))
	for id, d := range start {
		if d <= end {
			list = append(list, held{f.animals[id], d})
		}
	}
	sort.Slice(list, func(i, j int) bool {
		if list[i].day != list[j].day {
			return list[i].day < list[j].day
		}
		return list[i].a.ID < list[j].a.ID
	})
	out := map[string]any{"count": len(list), "exceeded_on": nil, "over_refs": []any{}, "over_animals": []any{}}
	// An approval that ended before the period is last period's business.
	if p.MaxAnimals != nil && len(list) > *p.MaxAnimals && p.ExpiresOn >= f.period.From {
		over := list[*p.MaxAnimals:]
		out["exceeded_on"] = over[0].day.String()
		rs, ids := []any{}, []any{}
		for _, h := range over[:min(len(over), maxOverRefs)] {
			rs = append(rs, string(h.a.Ref))
			ids = append(ids, h.a.ID)
		}
		out["over_refs"], out["over_animals"] = rs, ids
	}
	return out
}

// anyMap turns a map of ref lists into a document object.
func anyMap(m map[string][]any) map[string]any {
	out := make(map[string]any, len(m))
	for k, v := range m {
		out[k] = v
	}
	return out
}
