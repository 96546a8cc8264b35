package checker_test

import (
	"context"
	"fmt"

	"welfare/checker"
	"welfare/records"
	"welfare/records/demo"
	"welfare/rules"
)

// Check the built-in demo station's January with the shipped rules and
// default limits.
func ExamplePolicy_Check() {
	ctx := context.Background()
	lim, err := rules.Default()
	if err != nil {
		fmt.Println(err)
		return
	}
	policy, err := checker.Compile(ctx, lim, []checker.Source{{Name: "rules", FS: rules.FS()}}, checker.Options{})
	if err != nil {
		fmt.Println(err)
		return
	}
	from, _ := records.ParseDay("2026-01-01")
	to, _ := records.ParseDay("2026-01-31")
	res, err := policy.Check(ctx, demo.FS(), checker.Period{From: from, To: to}, []string{"enclosure"})
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
