package pdf_test

import (
	"bytes"
	"fmt"
	"time"

	"welfare/checker"
	"welfare/records"
	"welfare/reports"
	"welfare/reports/pdf"
)

func ExampleWrite() {
	on := records.MakeDay(2026, 1, 14)
	r := &checker.Result{
		Facility: "Birchfall Fur Research Station",
		Period:   checker.Period{From: records.MakeDay(2026, 1, 1), To: records.MakeDay(2026, 1, 31)},
		Findings: []checker.Finding{{
			Check: "care.water.unavailable", Domain: "care", Subject: "N-04", On: on, Severity: checker.Significant,
			Message: "water found frozen at 07:10 and not restored", Evidence: []records.Ref{"daily_care.csv:27"},
		}},
	}
	var b bytes.Buffer
	err := pdf.Write(&b, r, reports.PDFOptions{
		Inspector:   "Dr. Tuomas Vähäkangas",
		GeneratedAt: time.Date(2026, 2, 3, 9, 30, 0, 0, time.UTC),
	})
	if err != nil {
		fmt.Println(err)
	}
	fmt.Println(string(b.Bytes()[:8]))
	// Output:
	// %PDF-1.3
}
