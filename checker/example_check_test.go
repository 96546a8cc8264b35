package checker_test

import (
	"context"
	"fmt"
	"strings"

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
	// The rows the loader rejected are listed whatever the domains asked.
	for _, f := range res.Findings {
		fmt.Println(strings.TrimSpace(fmt.Sprint(f.Severity, " ", f.Check, " ", f.Subject, " ", f.On, " ", f.Until)))
	}
	// Output:
	// significant enclosure.height.insufficient AB-05 2026-01-01 2026-01-31
	// significant enclosure.space.insufficient K-01 2026-01-01 2026-01-31
	// significant enclosure.space.insufficient S4-25 2026-01-01 2026-01-31
	// minor enclosure.capacity.exceeded MB-07 2026-01-10 2026-01-31
	// minor enclosure.nest_box.missing S3-12 2026-01-01 2026-01-31
	// minor enclosure.platform.missing S2-05 2026-01-01 2026-01-31
	// minor records.row.rejected animals.csv:114 2026-01-05
	// minor records.row.rejected daily_care.csv:88 2026-01-07
	// minor records.row.rejected handling.csv:75 2026-01-01
	// minor records.row.rejected outdoor_work.csv:51 2026-01-12
	// minor records.row.rejected weather.csv:135 2026-01-17
}
