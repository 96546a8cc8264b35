package reports_test

import (
	"bytes"
	"fmt"
	"os"
	"strings"
	"time"

	"welfare/checker"
	"welfare/records"
	"welfare/reports"
)

// exampleResult is a small invented result: one site, one finding.
func exampleResult() *checker.Result {
	on := records.MakeDay(2026, 1, 14)
	return &checker.Result{
		Facility:    "Birchfall Fur Research Station",
		Period:      checker.Period{From: records.MakeDay(2026, 1, 1), To: records.MakeDay(2026, 1, 31)},
		Fingerprint: "3f9a1c07be52d4e8a6103f7c2b9e5d4a8c1f06e7d2b3a9c5e8f1d0a7b6c4e2f9",
		Accounting:  []records.FileCount{{File: "care_rounds.csv", Read: 62, Accepted: 62}},
		Findings: []checker.Finding{{
			Check: "care.water.unavailable", Domain: "care", Subject: "N-04", On: on, Severity: checker.Significant,
			Message: "water found frozen at 07:10 and not restored", Evidence: []records.Ref{"care_rounds.csv:27"},
			Title: "Water unavailable", Source: "OLAW: inoperative watering is a significant deficiency",
		}},
		Care: checker.CareCoverage{OccupiedDays: 31, CompleteDays: 31},
	}
}

func ExampleWriteText() {
	if err := reports.WriteText(os.Stdout, exampleResult(), reports.TextOptions{}); err != nil {
		fmt.Println(err)
	}
	// Output:
	// Welfare records check: Birchfall Fur Research Station
	// Period: 2026-01-01 to 2026-01-31 (inclusive)
	// Checks selected: all
	// Switched off: none
	// Limits: the built-in defaults
	// Local rules: none (only the shipped rules)
	// Not evaluated: none: every check in force was evaluated
	// Fingerprint: 3f9a1c07be52d4e8a6103f7c2b9e5d4a8c1f06e7d2b3a9c5e8f1d0a7b6c4e2f9
	//
	// Rows per file
	//   file                  read   accepted   rejected
	//   care_rounds.csv         62         62          0
	//   total                   62         62          0
	//
	// Findings by domain
	//   domain       significant        minor         note        total
	//   records                0            0            0            0
	//   care                   1            0            0            1
	//   enclosure              0            0            0            0
	//   handling               0            0            0            0
	//   staff                  0            0            0            0
	//   ppe                    0            0            0            0
	//   protocol               0            0            0            0
	//   cull                   0            0            0            0
	//   health                 0            0            0            0
	//   litter                 0            0            0            0
	//   cold                   0            0            0            0
	//   heat                   0            0            0            0
	//   environment            0            0            0            0
	//   total                  1            0            0            1
	//
	// Care records complete (an observed round and a feeding) on 31 of 31 occupied enclosure-days (100.0 %).
	//
	// Findings, most severe first (1)
	//
	// SIGNIFICANT  care.water.unavailable  N-04  2026-01-14
	//   water found frozen at 07:10 and not restored
	//   evidence: care_rounds.csv:27
	//
	// This report is a check of the records against the rules and limits in force; it is not a veterinary judgement. The attending veterinarian, the animal-care committee and local law decide on the animals' welfare and on any corrective action.
}

func ExampleWriteCSV() {
	if err := reports.WriteCSV(os.Stdout, exampleResult()); err != nil {
		fmt.Println(err)
	}
	// Output:
	// severity,check,domain,subject,on,until,message,evidence,title,source,report_to,key,problem,class,plan,action_status
	// significant,care.water.unavailable,care,N-04,2026-01-14,,water found frozen at 07:10 and not restored,care_rounds.csv:27,Water unavailable,OLAW: inoperative watering is a significant deficiency,,care.water.unavailable N-04 2026-01-14,care.water.unavailable N-04,,,
}

func ExampleWriteJSON() {
	var b bytes.Buffer
	if err := reports.WriteJSON(&b, exampleResult()); err != nil {
		fmt.Println(err)
	}
	// The head of the document; findings, checks and the rest follow.
	lines := strings.Split(b.String(), "\n")
	fmt.Println(strings.Join(lines[:6], "\n"))
	// Output:
	// {
	//   "facility": "Birchfall Fur Research Station",
	//   "period": {
	//     "from": "2026-01-01",
	//     "to": "2026-01-31"
	//   },
}

func ExampleBuildAudit() {
	a, err := reports.BuildAudit(exampleResult(), reports.PDFOptions{
		GeneratedAt: time.Date(2026, 2, 3, 9, 30, 0, 0, time.UTC),
	})
	if err != nil {
		fmt.Println(err)
		return
	}
	for _, s := range a.Sections {
		start := "follows on"
		if s.NewPage {
			start = "new page"
		}
		fmt.Printf("%s (%s): %d blocks\n", s.Title, start, len(s.Blocks))
	}
	// Output:
	// Cover (new page): 18 blocks
	// Summary (new page): 9 blocks
	// Findings (new page): 3 blocks
	// Limits in force (new page): 5 blocks
	// Cautions (new page): 18 blocks
	// Sign-off (follows on): 1 blocks
}
