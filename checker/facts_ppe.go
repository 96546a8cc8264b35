package checker

import (
	"sort"

	"welfare/records"
)

// ppeFacts adds each used item's "ppe" section: per day of use (a handling
// row's glove_id), the item's latest inspection on or before that day.
// The rules judge whether it was recent enough for the item's kind and
// whether it left the item fit to use.
func (f *facts) ppeFacts() {
	checks := map[string][]*records.PPECheck{}
	for i := range f.set.PPEChecks {
		c := &f.set.PPEChecks[i]
		checks[c.ItemID] = append(checks[c.ItemID], c)
	}
	for _, cs := range checks {
		// Stable: two checks of one day keep file order, the later row
		// being the later word on the item.
		sort.SliceStable(cs, func(i, j int) bool { return cs[i].CheckedOn < cs[j].CheckedOn })
	}

	type use struct {
		item  string
		day   records.Day
		glove string
		refs  []records.Ref
	}
	uses := map[string]map[records.Day]*use{}
	for i := range f.set.Handling {
		h := &f.set.Handling[i]
		d := records.DayOf(h.At)
		if h.GloveID == "" || !f.inPeriod(d) {
			continue
		}
		byDay := uses[h.GloveID]
		if byDay == nil {
			byDay = map[records.Day]*use{}
			uses[h.GloveID] = byDay
		}
		u := byDay[d]
		if u == nil {
			u = &use{item: h.GloveID, day: d, glove: h.Glove}
			byDay[d] = u
		}
		u.refs = append(u.refs, h.Ref)
	}

	for id, byDay := range uses {
		cs := checks[id]
		// The item's kind comes from its inspections; an item never
		// inspected is named by the glove the handling row recorded.
		kind := "glove"
		if len(cs) > 0 {
			kind = cs[len(cs)-1].Item
		}
		list := make([]*use, 0, len(byDay))
		for _, u := range byDay {
			list = append(list, u)
		}
		sort.Slice(list, func(i, j int) bool { return list[i].day < list[j].day })
		out := make([]any, 0, len(list))
		for _, u := range list {
			k := kind
			if len(cs) == 0 && u.glove == "gauntlet" {
				k = "gauntlet"
			}
			var last any
			n := sort.Search(len(cs), func(i int) bool { return cs[i].CheckedOn > u.day })
			if n > 0 {
				c := cs[n-1]
				last = map[string]any{
					"on": c.CheckedOn.String(), "ref": string(c.Ref), "condition": c.Condition,
					"action": nilIfEmpty(c.Action), "days_before": int(u.day - c.CheckedOn),
				}
			}
			out = append(out, map[string]any{
				"on": u.day.String(), "refs": refs(u.refs...), "kind": k, "last_check": last,
			})
		}
		f.doc("item", id)["ppe"] = map[string]any{"uses": out}
	}
}
