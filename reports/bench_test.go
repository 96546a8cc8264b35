package reports_test

import (
	"io"
	"testing"

	"welfare/reports/pdf"
)

// BenchmarkWritePDF10kFindings is the large report: 10,000 findings,
// listed up to the default per check and all attached as JSON and CSV.
func BenchmarkWritePDF10kFindings(b *testing.B) {
	r := sampleResult(10000)
	opt := sampleOptions()
	b.ReportAllocs()
	for b.Loop() {
		if err := pdf.Write(io.Discard, r, opt); err != nil {
			b.Fatal(err)
		}
	}
}
