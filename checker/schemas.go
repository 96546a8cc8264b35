package checker

import (
	"fmt"
	"slices"
	"strings"

	"github.com/open-policy-agent/opa/v1/ast"
	"github.com/open-policy-agent/opa/v1/util"

	"welfare/rules"
)

// Typed rule inputs: every package that names its subjects (custom.subjects
// in its package METADATA) is compiled with the input schema of those
// kinds (rules/schemas/KIND.json; several kinds: any one of them), unless
// its METADATA declares a schema for input itself. OPA's type checker then
// rejects a rule that reads a field no input of those kinds has, with the
// rule's file, row and column, instead of a rule that silently never fires.

// schemaRef names the input schema of a list of subject kinds:
// schema.welfare.enclosure, or schema.welfare.site_or_enclosure for a union.
func schemaRef(kinds []string) ast.Ref {
	return ast.MustParseRef("schema.welfare." + strings.Join(kinds, "_or_"))
}

// typeInputs adds the input schema annotation to the package METADATA of
// every module that names its subjects, and returns the schema set that
// resolves them. Bad subject lists are left to readMetadata to report.
func typeInputs(modules map[string]*ast.Module) (*ast.SchemaSet, error) {
	kindSchema := map[string]any{}
	for _, k := range SubjectKinds {
		b, err := rules.InputSchemaJSON(k)
		if err != nil {
			return nil, err
		}
		var s any
		if err := util.UnmarshalJSON(b, &s); err != nil {
			return nil, fmt.Errorf("input schema of %s: %w", k, err)
		}
		kindSchema[k] = s
	}
	ss := ast.NewSchemaSet()
	for _, m := range modules {
		for _, a := range m.Annotations {
			if a.Scope != "package" {
				continue
			}
			subjects, err := metaStrings(a.Custom["subjects"])
			if err != nil || len(subjects) == 0 || declaresInput(a) {
				continue
			}
			var parts []any
			for _, k := range subjects {
				if s, ok := kindSchema[k]; ok {
					parts = append(parts, s)
				}
			}
			if len(parts) != len(subjects) {
				continue // an unknown kind: readMetadata says which
			}
			ref := schemaRef(subjects)
			if len(parts) == 1 {
				ss.Put(ref, parts[0])
			} else {
				ss.Put(ref, map[string]any{"anyOf": parts})
			}
			a.Schemas = append(a.Schemas, &ast.SchemaAnnotation{Path: ast.InputRootRef.Copy(), Schema: ref})
		}
	}
	return ss, nil
}

func declaresInput(a *ast.Annotations) bool {
	return slices.ContainsFunc(a.Schemas, func(s *ast.SchemaAnnotation) bool {
		return s.Path.Equal(ast.InputRootRef)
	})
}
