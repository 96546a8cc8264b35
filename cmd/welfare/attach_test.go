package main

import (
	"bytes"
	"compress/zlib"
	"io"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"testing"
)

// embedded gives the files a PDF embeds, by name, uncompressed: each
// /Filespec names (in UTF-16) its /EmbeddedFile object, whose stream is
// deflated.
func embedded(t *testing.T, pdf []byte) map[string][]byte {
	t.Helper()
	spec := regexp.MustCompile(`(?s)/Type /Filespec .*?/UF \((.*?)\) /EF << /F (\d+) 0 R >>`)
	out := map[string][]byte{}
	for _, m := range spec.FindAllSubmatch(pdf, -1) {
		name := string(bytes.ReplaceAll(bytes.TrimPrefix(m[1], []byte("\xfe\xff")), []byte{0}, nil))
		obj := string(m[2])
		head := regexp.MustCompile(`(?s)(?:^|\n)` + obj + ` 0 obj\s*<< /Type /EmbeddedFile /Length (\d+) .*?stream\r?\n`)
		at := head.FindSubmatchIndex(pdf)
		if at == nil {
			t.Fatalf("embedded %s: object %s not found", name, obj)
		}
		n, _ := strconv.Atoi(string(pdf[at[2]:at[3]]))
		zr, err := zlib.NewReader(bytes.NewReader(pdf[at[1] : at[1]+n]))
		if err != nil {
			t.Fatalf("embedded %s: %v", name, err)
		}
		body, err := io.ReadAll(zr)
		if err != nil {
			t.Fatalf("embedded %s: %v", name, err)
		}
		out[name] = body
	}
	return out
}

// The PDF attaches findings.json and findings.csv: with --json and --csv
// given too, the very bytes of those files (written once, attached as
// they are); with the PDF alone, the same bytes written for it.
func TestPDFAttachesTheFilesWrittenBeside(t *testing.T) {
	tmp := t.TempDir()
	at := "--generated-at=2026-02-01T08:00:00Z"
	both := filepath.Join(tmp, "both")
	alone := filepath.Join(tmp, "alone")
	for _, d := range []string{both, alone} {
		if err := os.Mkdir(d, 0o755); err != nil {
			t.Fatal(err)
		}
	}
	if code, _, stderr := runMain(t, "check", demoRecords, "--fail-on", "never", at, "--pdf", filepath.Join(both, "audit.pdf"),
		"--json", filepath.Join(both, "findings.json"), "--csv", filepath.Join(both, "findings.csv")); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	if code, _, stderr := runMain(t, "check", demoRecords, "--fail-on", "never", at, "--pdf", filepath.Join(alone, "audit.pdf")); code != 0 {
		t.Fatalf("exit %d: %s", code, stderr)
	}
	read := func(p string) []byte {
		b, err := os.ReadFile(p)
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	for _, d := range []string{both, alone} {
		files := embedded(t, read(filepath.Join(d, "audit.pdf")))
		for _, name := range []string{"findings.json", "findings.csv"} {
			got, ok := files[name]
			if !ok {
				t.Fatalf("%s: %s not attached (attached: %d files)", d, name, len(files))
			}
			if want := read(filepath.Join(both, name)); !bytes.Equal(got, want) {
				t.Errorf("%s: attached %s (%d bytes) differs from the file written (%d bytes)", d, name, len(got), len(want))
			}
		}
	}
	if !bytes.Equal(read(filepath.Join(both, "audit.pdf")), read(filepath.Join(alone, "audit.pdf"))) {
		t.Error("the PDF written beside --json and --csv differs from the PDF written alone")
	}
}
