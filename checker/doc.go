// Package checker judges a records folder by the committee's rules and
// limits.
//
// # One face
//
// Callers see three things:
//
//	policy, err := checker.Compile(ctx, limits, sources, checker.Options{}) // once
//	res, err := policy.Check(ctx, recordsFS, period, only)                  // per folder
//	policy.Checks(); policy.Test(ctx, w, verbose)                           // what is in force; its tests
//
// Compile converts the limits (rules.ParseLimits) once into data.limits,
// parses and compiles the rule files in the sandbox and reads their
// METADATA. Check loads the folder through a capturing file system, so the
// result's fingerprint covers exactly the bytes read; computes the facts;
// evaluates; and returns a Result with everything a report needs
// (findings, what was not evaluated or evaluated only in part, row
// accounting, care coverage, the weather chart, the limits in force, the
// chart site of each subject).
//
// # Go measures, Rego judges
//
// The facts (facts_*.go) carry measurements: days, hours, counts, values,
// runs of days, and the rows behind them as FILE:LINE refs. The comparison
// with a limit that decides a finding is in the Rego rule, so a committee
// that edits a rule (< to <=) or a limit sees the outcome change. Go does
// not pre-judge and does not word findings. Where volume forces Go to
// pre-select (a year of daily entries per cage), it selects with the
// limits inclusively, the field's name says so
// (days_at_or_past_bedding_limits), and the rule still makes the deciding
// comparison on each entry.
//
// # Untrusted rules
//
// A committee's rule files are contained (sandbox.go): each defines a
// package of its own under welfare. that is not a shipped package's name
// (shipped files are recognised by path and bytes; Source.Trusted marks
// the project's test policies); anything else, package limits above all,
// is refused at its package line. The sandbox has no network, environment,
// random or wall-clock built-ins (time.now_ns, certificate and token
// verification), and every evaluation sees the same pinned time. Three
// time budgets bound the rules (Options): one package on one subject
// (Timeout, 5s), one package across all subjects (PackageBudget, 60s, the
// subjects' times added up) and the whole evaluation (TotalBudget, 5 min);
// each error names the package. A finding a rule gets wrong, evidence that
// names no line of a record file read included, becomes a
// rules.finding.malformed finding (MalformedCheck) naming the rule's
// file:row and the field; the rest still reports. The loader's rejected
// rows (Result.Rejected) are always records.row.rejected findings
// (RejectedCheck), whatever only, the rules in force or an "off" override
// say.
//
// # Files, by job
//
//	policy.go       Compile, Policy, Check, Test: the package's face
//	check.go        one run: period, facts, evaluation per subject kind, filtering, order
//	domains.go      the catalogue of domains, in report order, with their fact builders
//	facts.go        indexes shared by every domain; the input documents being built
//	facts_<d>.go    the facts of domain d (occupancy.go: who lived where, day by day)
//	schemas.go      typed inputs: rules/schemas/KIND.json given to the Rego compiler
//	sandbox.go      rule sources, the sandbox's built-ins, parsing, positioned errors
//	engine.go       compiling and preparing one query per rule package
//	metadata.go     rule packages and checks from their METADATA
//	evaluate.go     evaluating the subjects of one kind in parallel, under the time budgets; malformed findings
//	findings.go     decoding findings, collapsing runs, the report order
//	rulestest.go    the rules' own _test.rego tests (a failing one traced again for what it saw)
//	limitrefs.go    the data.limits paths each check reads, from the compiled rules
//	explain.go      --explain: one finding's subject evaluated again, its limits and evidence lines
//	facts_extra.go  the committee's own x_ columns as extra on the objects of their rows
//	fingerprint.go  the SHA-256 over records, rules and limits as read
//	partial.go      the checks evaluated only in part (Result.Partial), counted from the facts
//	result.go, finding.go  what reports render
//
// # Add a field to a rule input
//
//  1. Compute it in the domain's fact builder (facts_<domain>.go) on the
//     subject's document: f.doc(kind, id)[section][field]. Give a
//     measurement, not a verdict; a value that may be missing is null, never
//     a default. Days are "YYYY-MM-DD", evidence is a list of "FILE:LINE".
//  2. Add it to rules/schemas/KIND.json with its type ("null" in the type
//     list when it may be missing) and a description a committee can read.
//     Until it is there, a rule that reads it does not compile, and
//     TestFactsMatchInputSchemas fails on the demo.
//  3. Read it in the rule and compare it with a limit from rules/limits.yaml.
//     'welfare rules input KIND' shows the new field.
//
// A new subject kind needs SubjectKinds, a schema file and a fact builder
// that creates its documents. A new domain needs an entry in domains (in
// report order) and its fact builder.
//
// Every document carries kind, id, name and ref at the top (facts.doc puts
// them there: name is a person's name, a protocol's title or the
// facility's name, ref the FILE:LINE of the subject's own row, null when
// there is none); lists of entries carry on (the day) and their rows as
// ref, refs or evidence. An object whose ref names a row with local
// columns (x_…, records.Set.Extra) gets extra: {x_name: "text"} after the
// fact builders have run (facts.addExtra); every object schema with a ref
// allows extra, so a fact builder need do nothing for it.
package checker
