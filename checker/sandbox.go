package checker

import (
	"errors"
	"fmt"
	"io/fs"
	"path"
	"regexp"
	"strings"

	"github.com/open-policy-agent/opa/v1/ast"
)

// Source is one set of Rego files: the embedded shipped rules or a folder a
// committee points at. Name prefixes the file paths shown in messages
// ("rules/care.rego:12:3: ...").
type Source struct {
	Name string
	FS   fs.FS
	// Local marks a committee's own rules (a --rules folder), as opposed
	// to the shipped ones: their checks and findings are marked "local".
	Local bool
}

// RulesError lists every problem that stops a rule set from loading: parse
// errors, compile errors and bad METADATA, each as "file:row:col: message".
type RulesError struct {
	Problems []string
}

// Error is one problem per line.
func (e *RulesError) Error() string {
	return strings.Join(e.Problems, "\n")
}

// sandboxCapabilities is this OPA version's built-ins minus everything that
// reaches the network, the environment or gives a different answer each run:
// user rules must not leak records or make a report unrepeatable.
func sandboxCapabilities() *ast.Capabilities {
	caps := ast.CapabilitiesForThisVersion()
	kept := caps.Builtins[:0]
	for _, b := range caps.Builtins {
		if refusedBuiltin(b) {
			continue
		}
		kept = append(kept, b)
	}
	caps.Builtins = kept
	caps.AllowNet = []string{}
	return caps
}

func refusedBuiltin(b *ast.Builtin) bool {
	return b.Name == "http.send" || b.Name == "opa.runtime" ||
		strings.HasPrefix(b.Name, "net.") || b.Nondeterministic
}

// refusedNames are the built-ins sandboxCapabilities removes, so that an
// "undefined function" error can say why.
var refusedNames = func() map[string]bool {
	m := map[string]bool{}
	for _, b := range ast.CapabilitiesForThisVersion().Builtins {
		if refusedBuiltin(b) {
			m[b.Name] = true
		}
	}
	return m
}()

func newCompiler(caps *ast.Capabilities) *ast.Compiler {
	return ast.NewCompiler().
		WithCapabilities(caps).
		WithStrict(true).
		WithDefaultRegoVersion(ast.RegoV1)
}

// parseSources reads every .rego file of sources. With tests false, files
// ending in _test.rego are skipped; with true they are included.
func parseSources(sources []Source, tests bool) (map[string]*ast.Module, []ruleFile, error) {
	modules := map[string]*ast.Module{}
	var files []ruleFile
	var problems []string
	opts := ast.ParserOptions{ProcessAnnotation: true, RegoVersion: ast.RegoV1}
	for _, src := range sources {
		if src.FS == nil {
			return nil, nil, fmt.Errorf("rules source %q has no files", src.Name)
		}
		err := fs.WalkDir(src.FS, ".", func(p string, d fs.DirEntry, err error) error {
			if err != nil {
				return err
			}
			if d.IsDir() || !strings.HasSuffix(p, ".rego") {
				return nil
			}
			if strings.HasSuffix(p, "_test.rego") && !tests {
				return nil
			}
			name := p
			if src.Name != "" {
				name = path.Join(src.Name, p)
			}
			if _, dup := modules[name]; dup {
				problems = append(problems, name+": file given twice")
				return nil
			}
			b, err := fs.ReadFile(src.FS, p)
			if err != nil {
				return err
			}
			files = append(files, ruleFile{source: src.Name, path: p, data: b})
			m, err := ast.ParseModuleWithOpts(name, string(b), opts)
			if err != nil {
				problems = append(problems, formatASTErrors(err)...)
				return nil
			}
			if m == nil {
				problems = append(problems, name+":1:1: empty policy file (no package)")
				return nil
			}
			modules[name] = m
			return nil
		})
		if err != nil {
			return nil, nil, fmt.Errorf("reading rules %s: %w", src.Name, err)
		}
	}
	if len(problems) > 0 {
		return nil, nil, &RulesError{Problems: problems}
	}
	return modules, files, nil
}

func formatASTErrors(err error) []string {
	var errs ast.Errors
	if !errors.As(err, &errs) {
		return []string{err.Error()}
	}
	out := make([]string, 0, len(errs))
	for _, e := range errs {
		out = append(out, formatASTError(e))
	}
	return out
}

var undefinedFunction = regexp.MustCompile(`undefined function ([A-Za-z0-9_.]+)`)

func formatASTError(e *ast.Error) string {
	msg := e.Message
	if m := undefinedFunction.FindStringSubmatch(msg); m != nil && refusedNames[m[1]] {
		msg = fmt.Sprintf("%s is not allowed in welfare rules: rules run without network, environment or nondeterministic built-ins", m[1])
	}
	if e.Location == nil {
		return msg
	}
	return fmt.Sprintf("%s:%d:%d: %s", e.Location.File, e.Location.Row, e.Location.Col, msg)
}

func compileError(errs ast.Errors) error {
	out := make([]string, 0, len(errs))
	for _, e := range errs {
		out = append(out, formatASTError(e))
	}
	return &RulesError{Problems: out}
}
