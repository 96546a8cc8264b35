package checker

import (
	"context"
	"io"
	"io/fs"

	"welfare/records"
)

// The engine, the run and the test runner under their own names, for tests
// that give them hand-made limits documents and record sets.
type (
	Engine        = engine
	EngineOptions = Options
	Config        = config
)

var (
	NewEngine = newEngine
	RunTests  = runTests
)

// EvaluateRun is Evaluate as one check runs it: under the whole
// evaluation's budget.
func EvaluateRun(ctx context.Context, e *Engine, kind string, inputs []map[string]any) ([]Finding, error) {
	ctx, cancel := e.startRun(ctx, nil)
	defer cancel()
	return e.Evaluate(ctx, kind, inputs)
}

func Check(ctx context.Context, cfg Config) (*Result, error) { return check(ctx, cfg) }

// Fingerprint reads the record files the loader reads from fsys (the
// regular files of the folder with record names: records.FilesRead) through
// a captureFS, as Policy.Check does, and fingerprints them with rules and
// limits.
func Fingerprint(fsys fs.FS, rules []ruleFile, limits []byte) (string, error) {
	c := newCaptureFS(fsys)
	for _, name := range records.FilesRead(c) {
		f, err := records.OpenFile(context.Background(), c, name)
		if err != nil {
			return "", err
		}
		_, err = io.Copy(io.Discard, f)
		f.Close()
		if err != nil {
			return "", err
		}
	}
	return fingerprint(c.read(), rules, limits, nil), nil
}
