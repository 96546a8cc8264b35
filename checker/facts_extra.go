package checker

import "welfare/records"

// addExtra gives every object of the documents whose ref names a row with
// local columns (records.Set.Extra) an extra object of those columns, as
// text: the subject's own row on its document, an event's row on the
// entry of that event wherever the facts list it. Nothing is walked when
// no file has a local column.
func (f *facts) addExtra() {
	extra := f.set.Extra
	if len(extra) == 0 {
		return
	}
	var walk func(v any)
	walk = func(v any) {
		switch x := v.(type) {
		case map[string]any:
			if ref, ok := x["ref"].(string); ok {
				if cols, ok := extra[records.Ref(ref)]; ok {
					m := make(map[string]any, len(cols))
					for k, c := range cols {
						m[k] = c
					}
					x["extra"] = m
				}
			}
			for k, e := range x {
				if k != "extra" {
					walk(e)
				}
			}
		case []any:
			for _, e := range x {
				walk(e)
			}
		case []map[string]any:
			for _, e := range x {
				walk(e)
			}
		case *lazy:
			// The section gets its extras each time it is made (from
			// the plain value: the direct term has none).
			mk := x.make
			x.term = nil
			x.make = func() any {
				v := mk()
				walk(v)
				return v
			}
		}
	}
	for _, byID := range f.docs {
		for _, d := range byID {
			walk(d)
		}
	}
}
