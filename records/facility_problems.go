package records

import (
	"regexp"
	"sort"
	"strconv"
	"strings"

	"go.yaml.in/yaml/v3"
)

// The YAML decoder speaks of Go types ("cannot unmarshal !!str `S1` into
// records.Building"); a keeper needs to hear what was written and what
// belongs there instead.

var (
	yamlUnmarshal = regexp.MustCompile("^line (\\d+): cannot unmarshal !!(\\w+) (`[^`]*` )?into (\\S+)$")
	yamlUnknown   = regexp.MustCompile(`^line (\d+): field (\S+) not found in type (\S+)$`)
)

// yamlWritten names a YAML value's type as written.
var yamlWritten = map[string]string{
	"str": "text", "int": "a whole number", "float": "a number", "bool": "yes or no",
	"seq": "a list", "map": "a block of keys", "null": "empty", "timestamp": "a date",
}

// yamlWanted names what a facility.yaml key holds.
var yamlWanted = map[string]string{
	"records.Facility":   "the facility's keys (name, time_zone, buildings, weather_sites)",
	"records.Building":   "a building: a block of keys (id, exposure, weather_site)",
	"[]records.Building": "a list of buildings, each starting with \"- id:\"",
	"[]string":           "a list, such as [MAST, YARD]",
	"string":             "text",
	"int":                "a whole number",
	"float64":            "a number",
	"bool":               "yes or no",
}

// yamlKeys are the keys each block of facility.yaml may hold.
var yamlKeys = map[string]string{
	"records.Facility": "name, time_zone, buildings, weather_sites",
	"records.Building": "id, exposure, weather_site",
}

// facilityTypeProblem turns one message of a yaml.TypeError into words.
func facilityTypeProblem(doc *yaml.Node, msg string) *LoadError {
	le := &LoadError{File: facilityFile, Reason: strings.TrimPrefix(msg, "yaml: ")}
	if m := yamlUnmarshal.FindStringSubmatch(msg); m != nil {
		le.Line, _ = strconv.Atoi(m[1])
		le.Column = keyAtLine(doc, le.Line)
		written := yamlWritten[m[2]]
		if written == "" {
			written = m[2]
		}
		wanted := yamlWanted[m[4]]
		if wanted == "" {
			wanted = strings.TrimPrefix(m[4], "records.")
		}
		val := strings.TrimSuffix(strings.Trim(m[3], "` "), "`")
		if val != "" {
			le.Reason = strconv.Quote(val) + " is " + written + ", but " + wanted + " belongs here"
		} else {
			le.Reason = "this is " + written + ", but " + wanted + " belongs here"
		}
		return le
	}
	if m := yamlUnknown.FindStringSubmatch(msg); m != nil {
		le.Line, _ = strconv.Atoi(m[1])
		le.Column, le.Reason = m[2], "unknown key"
		if keys := yamlKeys[m[3]]; keys != "" {
			le.Reason += " (the keys here are " + keys + ")"
		}
		return le
	}
	if m := yamlLine.FindStringSubmatch(le.Reason); m != nil {
		le.Line, _ = strconv.Atoi(m[1])
		le.Reason = m[2]
	}
	return le
}

// keyAtLine is the dotted path ("buildings[1].exposure") of the key or
// value that starts on a line, "" when none does.
func keyAtLine(doc *yaml.Node, line int) string {
	var walk func(n *yaml.Node, path string) string
	walk = func(n *yaml.Node, path string) string {
		switch n.Kind {
		case yaml.MappingNode:
			for i := 0; i+1 < len(n.Content); i += 2 {
				k, v := n.Content[i], n.Content[i+1]
				p := k.Value
				if path != "" {
					p = path + "." + k.Value
				}
				if found := walk(v, p); found != "" {
					return found
				}
				if k.Line == line {
					return p
				}
			}
		case yaml.SequenceNode:
			for i, c := range n.Content {
				p := path + "[" + strconv.Itoa(i) + "]"
				if found := walk(c, p); found != "" {
					return found
				}
				if c.Line == line {
					return p
				}
			}
		}
		return ""
	}
	return walk(doc, "")
}

// joinLoadErrors returns the first problem (by line) with the others in Also.
func joinLoadErrors(ps []*LoadError) *LoadError {
	sort.SliceStable(ps, func(i, j int) bool { return ps[i].Line < ps[j].Line })
	first := *ps[0]
	first.Also = ps[1:]
	return &first
}
