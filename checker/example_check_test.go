package checker_test

import (
	"bytes"
	"context"
	"fmt"

	"welfare/checker"
	"welfare/records"
	"welfare/records/demo"
	"welfare/rules"
)

// Check the built-in demo station's January with the shipped rules and
// default limits.
func ExampleCheck() {
	ctx := context.Background()
	lim, err := rules.LoadLimits(bytes.NewReader(rules.DefaultLimits()), "limits.yaml")
	if err != nil {
		fmt.Println(err)
		return
	}
	data, _ := lim.Data()
	engine, err := checker.NewEngine(ctx, []checker.Source{{Name: "rules", FS: rules.FS()}}, data, checker.EngineOptions{})
	if err != nil {
		fmt.Println(err)
		return
	}
	set, err := records.Load(demo.FS(), records.Options{Species: lim.SpeciesCodes()})
	if err != nil {
		fmt.Println(err)
		return
	}
	from, _ := records.ParseDay("2026-01-01")
	to, _ := records.ParseDay("2026-01-31")
	res, err := checker.Check(ctx, checker.Config{Records: set, Limits: lim, Engine: engine, Period: checker.Period{From: from, To: to}, Only: []string{"enclosure"}})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, f := range res.Findings {
		fmt.Println(f.Severity, f.Check, f.Subject, f.On, f.Until)
	}
	// Output:
	// significant enclosure.height.insufficient AB-05 2026-01-01 2026-01-31
	// significant enclosure.space.insufficient K-01 2026-01-01 2026-01-31
	// significant enclosure.space.insufficient S4-25 2026-01-01 2026-01-31
	// minor enclosure.capacity.exceeded MB-07 2026-01-10 2026-01-31
	// minor enclosure.nest_box.missing S3-12 2026-01-01 2026-01-31
	// minor enclosure.platform.missing S2-05 2026-01-01 2026-01-31
}
