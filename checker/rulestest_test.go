package checker_test

import (
	"bytes"
	"context"
	"os"
	"strings"
	"testing"

	"welfare/checker"
)

func TestRunTests(t *testing.T) {
	tests := []struct {
		name         string
		dir          string
		pass, fail   int
		wantInOutput []string
	}{
		{"passing", "testdata/policies/basic", 3, 0, []string{
			"PASS rules/care_test.rego:7 welfare.care_test.test_observed_day_gives_no_finding\n",
			"PASS rules/care_test.rego:18 welfare.care_test.test_limits_are_data\n",
			"3 passed, 0 failed\n",
		}},
		{"failing", "testdata/policies/failing", 1, 1, []string{
			"PASS rules/care_test.rego:5 welfare.care_test.test_fires_once\n",
			"FAIL rules/care_test.rego:10 welfare.care_test.test_never_fires\n",
			"1 passed, 1 failed\n",
		}},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var out bytes.Buffer
			src := []checker.Source{{Name: "rules", FS: os.DirFS(tt.dir), Trusted: true}}
			pass, fail, err := checker.RunTests(context.Background(), src, engLimits(nil), &out, false)
			if err != nil {
				t.Fatal(err)
			}
			if pass != tt.pass || fail != tt.fail {
				t.Errorf("RunTests = %d passed, %d failed; want %d, %d\n%s", pass, fail, tt.pass, tt.fail, out.String())
			}
			for _, s := range tt.wantInOutput {
				if !strings.Contains(out.String(), s) {
					t.Errorf("output lacks %q:\n%s", s, out.String())
				}
			}
		})
	}
}

func TestRunTestsVerbose(t *testing.T) {
	var out bytes.Buffer
	src := engUser(map[string]string{"p_test.rego": "package welfare.p_test\n\ntest_prints if {\n\tprint(\"hello from the test\")\n}\n"})
	pass, fail, err := checker.RunTests(context.Background(), src, nil, &out, true)
	if err != nil || pass != 1 || fail != 0 {
		t.Fatalf("RunTests = %d, %d, %v; want 1, 0, nil\n%s", pass, fail, err, out.String())
	}
	for _, s := range []string{"PASS user/p_test.rego:3 welfare.p_test.test_prints (", "    hello from the test\n"} {
		if !strings.Contains(out.String(), s) {
			t.Errorf("verbose output lacks %q:\n%s", s, out.String())
		}
	}
}

func TestRunTestsRefusesSandboxEscapes(t *testing.T) {
	src := engUser(map[string]string{"probe_test.rego": "package welfare.probe_test\n\ntest_clock if {\n\ttime.now_ns() > 0\n}\n"})
	_, _, err := checker.RunTests(context.Background(), src, nil, &bytes.Buffer{}, false)
	want := "user/probe_test.rego:4:2: time.now_ns is not allowed in welfare rules"
	if err == nil || !strings.HasPrefix(err.Error(), want) {
		t.Errorf("error = %v, want it to start with %q", err, want)
	}
}

func TestRunTestsChecksMetadata(t *testing.T) {
	src := engUser(map[string]string{
		"p.rego":      "package welfare.p\n\nfindings contains \"x\" if false\n",
		"p_test.rego": "package welfare.p_test\n\ntest_ok if true\n",
	})
	_, _, err := checker.RunTests(context.Background(), src, nil, &bytes.Buffer{}, false)
	want := "user/p.rego:1:1: package welfare.p defines findings but has no package METADATA with custom.subjects"
	if err == nil || !strings.HasPrefix(err.Error(), want) {
		t.Errorf("error = %v, want it to start with %q", err, want)
	}
}
