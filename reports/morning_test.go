package reports_test

import (
	"bytes"
	"testing"

	"welfare/reports"
)

// The caution is part of every morning view; its words are the ones the
// project's rules ask for, so a rewording must be deliberate.
func TestMorningCautionWording(t *testing.T) {
	for _, must := range []string{"cold injury", "work/warm-up schedule", "not a veterinary judgement",
		"attending veterinarian", "animal-care committee", "local law"} {
		if !bytes.Contains([]byte(reports.MorningCaution), []byte(must)) {
			t.Errorf("MorningCaution lacks %q", must)
		}
	}
	for _, must := range []string{"heat illness", "water, shade and rest", "not a veterinary judgement",
		"attending veterinarian", "animal-care committee", "local law"} {
		if !bytes.Contains([]byte(reports.HeatCaution), []byte(must)) {
			t.Errorf("HeatCaution lacks %q", must)
		}
	}
}
