package records

import (
	"bytes"
	"errors"
	"regexp"
	"strconv"
	"strings"

	"github.com/go-playground/validator/v10"
	"go.yaml.in/yaml/v3"
)

// yamlLine finds "line N:" in a yaml.v3 error message.
var yamlLine = regexp.MustCompile(`line (\d+): (.*)`)

// DecodeYAML decodes a YAML file strictly into v: a syntax error, a value of
// the wrong type or an unknown key (a misspelt limit would otherwise be
// silently left at its default) is a *LoadError with the file, line and
// key. It returns the document's root node, so that problems found after
// decoding can be positioned with KeyLine. facility.yaml and limits files
// are both read this way.
func DecodeYAML(file string, data []byte, v any) (*yaml.Node, error) {
	data = bytes.TrimPrefix(data, []byte("\ufeff"))
	var root yaml.Node
	if err := yaml.Unmarshal(data, &root); err != nil {
		return nil, yamlError(file, err)
	}
	if len(root.Content) == 0 {
		return nil, &LoadError{File: file, Reason: "is empty"}
	}
	dec := yaml.NewDecoder(bytes.NewReader(data))
	dec.KnownFields(true)
	if err := dec.Decode(v); err != nil {
		return nil, yamlError(file, err)
	}
	return root.Content[0], nil
}

func yamlError(file string, err error) *LoadError {
	var te *yaml.TypeError
	msg := err.Error()
	if errors.As(err, &te) && len(te.Errors) > 0 {
		msg = te.Errors[0]
	}
	msg = strings.TrimPrefix(msg, "yaml: ")
	le := &LoadError{File: file, Reason: msg, Err: err}
	if m := yamlLine.FindStringSubmatch(msg); m != nil {
		le.Line, _ = strconv.Atoi(m[1])
		le.Reason = m[2]
		// "field foo not found in type records.Facility" says it in Go terms.
		if name, ok := strings.CutPrefix(le.Reason, "field "); ok {
			if k, _, ok := strings.Cut(name, " not found"); ok {
				le.Column, le.Reason = k, "unknown key"
			}
		}
	}
	return le
}

// YAMLPath is the dotted path of the value a validator error is about
// ("buildings[1].exposure"), for a validator whose tag names are the YAML
// keys: the namespace without the Go type name.
func YAMLPath(fe validator.FieldError) string {
	key := fe.Namespace()
	if _, rest, ok := strings.Cut(key, "."); ok {
		return rest
	}
	return key
}

// KeyLine finds the line of a path such as "buildings[1].exposure" in a
// document from DecodeYAML, falling back to the deepest part that exists (a
// missing key has no line of its own); 0 when nothing matches.
func KeyLine(doc *yaml.Node, path string) int {
	line := 0
	n := doc
	for part := range strings.SplitSeq(path, ".") {
		name, idx, hasIdx := strings.Cut(part, "[")
		var key *yaml.Node
		if n != nil && n.Kind == yaml.MappingNode {
			for i := 0; i+1 < len(n.Content); i += 2 {
				if n.Content[i].Value == name {
					key, n = n.Content[i], n.Content[i+1]
					break
				}
			}
		}
		if key == nil {
			return line
		}
		line = key.Line
		if !hasIdx {
			continue
		}
		idx = strings.TrimSuffix(idx, "]")
		switch n.Kind {
		case yaml.SequenceNode: // buildings[1]
			i, err := strconv.Atoi(idx)
			if err != nil || i >= len(n.Content) {
				return line
			}
			n = n.Content[i]
			line = n.Line
		case yaml.MappingNode: // species[vulpes_vulpes], as validator names map entries
			key := mapKey(n, idx)
			if key == nil {
				return line
			}
			n, line = mapValue(n, idx), key.Line
		default:
			return line
		}
	}
	return line
}

// mapKey returns the key node of key in a mapping node.
func mapKey(n *yaml.Node, key string) *yaml.Node {
	if n == nil || n.Kind != yaml.MappingNode {
		return nil
	}
	for i := 0; i+1 < len(n.Content); i += 2 {
		if n.Content[i].Value == key {
			return n.Content[i]
		}
	}
	return nil
}

// mapValue returns the value node of key in a mapping node.
func mapValue(n *yaml.Node, key string) *yaml.Node {
	if n == nil || n.Kind != yaml.MappingNode {
		return nil
	}
	for i := 0; i+1 < len(n.Content); i += 2 {
		if n.Content[i].Value == key {
			return n.Content[i+1]
		}
	}
	return nil
}
