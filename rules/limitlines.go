package rules

import (
	"fmt"
	"regexp"
	"strings"

	"go.yaml.in/yaml/v3"
)

// LimitLine is one value of the limits file: "cold.bedding_days = 7  [F] ...".
type LimitLine struct {
	Key    string
	Value  string
	Source string
}

// Lines flattens the limits into one line per value, each with the source
// tag its comment in the limits text gives: the "limits in force" of a
// report. Limits not made by ParseLimits have no text and give none.
func (l *Limits) Lines() []LimitLine {
	if len(l.src) == 0 {
		return nil
	}
	return limitLines(l.src)
}

// sourceTag finds a value's source tag in its comment: [P] ..., [C], [F], [M].
var sourceTag = regexp.MustCompile(`\[[PCFM]\].*`)

// sameTag is a comment that points at the source above it ("[P] same: 1.2
// m² for two"); a report line stands alone, so it gets the source spelt out.
var sameTag = regexp.MustCompile(`^\[[PCFM]\] same\b(:?)(.*)$`)

// limitLines flattens a limits file into one line per value, each with the
// source its comment gives (or the nearest enclosing key's, for values in a
// block whose heading carries the source). Unparseable text gives none: the
// file was already validated when it was loaded.
func limitLines(src []byte) []LimitLine {
	var root yaml.Node
	if yaml.Unmarshal(src, &root) != nil || len(root.Content) == 0 {
		return nil
	}
	var out []LimitLine
	prev := "" // the last source written out in full, for "[P] same ..."
	resolve := func(src string) string {
		m := sameTag.FindStringSubmatch(src)
		if m == nil {
			if src != "" {
				prev = src
			}
			return src
		}
		if prev == "" {
			return src
		}
		if m[1] == ":" {
			return prev + ";" + m[2]
		}
		return strings.TrimSpace(prev + m[2])
	}
	var walk func(n *yaml.Node, key, inherited string)
	walk = func(n *yaml.Node, key, inherited string) {
		switch n.Kind {
		case yaml.MappingNode:
			for i := 0; i+1 < len(n.Content); i += 2 {
				k, v := n.Content[i], n.Content[i+1]
				src := resolve(tagOf(k.LineComment, v.LineComment))
				if src == "" {
					src = inherited
				}
				child := k.Value
				if key != "" {
					child = key + "." + k.Value
				}
				if v.Kind == yaml.MappingNode && !flowLeaf(v) {
					walk(v, child, src)
					continue
				}
				if v.Kind == yaml.SequenceNode && len(v.Content) > 0 && v.Content[0].Kind == yaml.MappingNode {
					// A table (the work/warm-up rows): one line per row reads better than one blob.
					for i, row := range v.Content {
						out = append(out, LimitLine{Key: fmt.Sprintf("%s[%d]", child, i), Value: flat(row), Source: src})
					}
					continue
				}
				out = append(out, LimitLine{Key: child, Value: flat(v), Source: src})
			}
		}
	}
	walk(root.Content[0], "", "")
	return out
}

// flowLeaf treats a short inline mapping ({sedation: true}) as one value.
func flowLeaf(n *yaml.Node) bool { return n.Style&yaml.FlowStyle != 0 }

func tagOf(comments ...string) string {
	for _, c := range comments {
		if m := sourceTag.FindString(c); m != "" {
			return strings.TrimSpace(m)
		}
	}
	return ""
}

// flat renders a value on one line as it would be written in YAML flow style.
func flat(n *yaml.Node) string {
	switch n.Kind {
	case yaml.ScalarNode:
		return n.Value
	case yaml.SequenceNode:
		parts := make([]string, len(n.Content))
		for i, c := range n.Content {
			parts[i] = flat(c)
		}
		return "[" + strings.Join(parts, ", ") + "]"
	case yaml.MappingNode:
		parts := make([]string, 0, len(n.Content)/2)
		for i := 0; i+1 < len(n.Content); i += 2 {
			parts = append(parts, n.Content[i].Value+": "+flat(n.Content[i+1]))
		}
		return "{" + strings.Join(parts, ", ") + "}"
	}
	return ""
}
