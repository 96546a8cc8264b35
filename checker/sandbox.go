package checker

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"path"
	"regexp"
	"strings"
	"time"

	"github.com/open-policy-agent/opa/v1/ast"

	"welfare/rules"
)

// Source is one set of Rego files: the embedded shipped rules or a folder a
// committee points at. Name prefixes the file paths shown in messages
// ("rules/care.rego:12:3: ...").
type Source struct {
	Name string
	FS   fs.FS
	// Trusted marks the project's own rule files (test policies): their
	// packages are not contained. A file whose path and bytes are those of
	// a shipped rule file (rules.FS) is trusted without it; every other
	// file, a committee's --rules folder above all, is contained (see
	// containPackage).
	Trusted bool
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
		strings.HasPrefix(b.Name, "net.") || b.Nondeterministic || wallClock[b.Name]
}

// wallClock are the built-ins whose answer depends on the time of the run
// (besides those OPA marks nondeterministic, which are refused anyway): a
// certificate is valid or expired depending on when it is verified, and a
// token's exp and nbf are compared with the clock. A finding must not
// depend on the day the check happens to run.
var wallClock = map[string]bool{
	"time.now_ns": true,
	"crypto.x509.parse_and_verify_certificates":              true, // verified at the current time
	"crypto.x509.parse_and_verify_certificates_with_options": true, // CurrentTime defaults to now
	"io.jwt.decode_verify":                                   true, // exp and nbf against now
}

// pinnedTime is the clock every evaluation sees (rego.EvalTime), so that
// a built-in left in the sandbox that reads the evaluation's time gets the
// same answer on every run. It is the Unix epoch: no rule can mistake it
// for a day of the records.
var pinnedTime = time.Unix(0, 0).UTC()

// shippedFiles are the shipped rule files by path, with their bytes.
var shippedFiles = func() map[string][]byte {
	m := map[string][]byte{}
	_ = fs.WalkDir(rules.FS(), ".", func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() || !strings.HasSuffix(p, ".rego") {
			return nil
		}
		if b, err := fs.ReadFile(rules.FS(), p); err == nil {
			m[p] = b
		}
		return nil
	})
	return m
}()

// shippedPackages are the second parts of the shipped package names
// (care for welfare.care, care_test for welfare.care_test): names a
// committee package may not take.
var shippedPackages = func() map[string]bool {
	m := map[string]bool{}
	for p, b := range shippedFiles {
		mod, err := ast.ParseModuleWithOpts(p, string(b), ast.ParserOptions{RegoVersion: ast.RegoV1})
		if err != nil || mod == nil {
			continue
		}
		parts := packageParts(mod)
		if len(parts) >= 2 && parts[0] == "welfare" {
			m[parts[1]] = true
		}
	}
	return m
}()

// shipped reports whether f is one of the shipped rule files byte for byte,
// whatever source gives it. It is the one test of both questions asked of a
// rule file: is it trusted (not held to a rules folder's package limits,
// parseSources), and are its checks the committee's own (localFiles)?
func (f ruleFile) shipped() bool {
	s, ok := shippedFiles[f.path]
	return ok && bytes.Equal(s, f.data)
}

// packageParts is a module's package path without data: [welfare care].
func packageParts(m *ast.Module) []string {
	var out []string
	for _, t := range m.Package.Path[1:] {
		s, ok := t.Value.(ast.String)
		if !ok {
			return append(out, t.String())
		}
		out = append(out, string(s))
	}
	return out
}

// containPackage keeps a committee's module in a package of its own: under
// welfare., not a shipped package's name or under one, and nothing at any
// other root (package limits would shadow data.limits, the limits every
// rule reads). It returns the problem as "file:row:col: message", or "".
func containPackage(m *ast.Module) string {
	parts := packageParts(m)
	name := strings.Join(parts, ".")
	loc := m.Package.Location
	at := func(format string, args ...any) string {
		msg := fmt.Sprintf(format, args...)
		if loc == nil {
			return msg
		}
		return fmt.Sprintf("%s:%d:%d: %s", loc.File, loc.Row, loc.Col, msg)
	}
	switch {
	case len(parts) > 0 && parts[0] == "limits":
		return at("package %s is refused: data.limits are the limits in force, which rules read but never define; put the rules in a package of their own, welfare.NAME", name)
	case len(parts) < 2 || parts[0] != "welfare":
		return at("package %s is refused: a committee's rules go in a package of their own under welfare. (welfare.NAME)", name)
	case shippedPackages[parts[1]]:
		return at("package %s is refused: welfare.%s is a shipped package, which a rules folder may not add to or change; choose a name of your own (welfare.NAME)", name, parts[1])
	}
	return ""
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
			rf := ruleFile{source: src.Name, path: p, data: b}
			files = append(files, rf)
			m, err := ast.ParseModuleWithOpts(name, string(b), opts)
			if err != nil {
				problems = append(problems, formatASTErrors(err)...)
				return nil
			}
			if m == nil {
				problems = append(problems, name+":1:1: empty policy file (no package)")
				return nil
			}
			if !src.Trusted && !rf.shipped() {
				if msg := containPackage(m); msg != "" {
					problems = append(problems, msg)
					return nil
				}
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
		msg = fmt.Sprintf("%s is not allowed in welfare rules: rules run without network, environment, wall clock or nondeterministic built-ins", m[1])
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
