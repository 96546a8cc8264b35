package checker

import "context"

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

func Check(ctx context.Context, cfg Config) (*Result, error) { return check(ctx, cfg) }
