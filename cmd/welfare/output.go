package main

import (
	"bufio"
	"context"
	"fmt"
	"io"
	"os"
	"path/filepath"
)

// checkOutputs refuses --json, --csv and --pdf paths that could not be
// written, before any work: an hour's check should not end in "no such
// folder". The folder must exist and take a new file; the path must not be
// a folder; two outputs must not share one path.
func checkOutputs(o *checkOpts) error {
	seen := map[string]string{}
	for _, out := range []struct{ flag, path string }{{"json", o.jsonOut}, {"csv", o.csvOut}, {"csv", scopePath(o.csvOut)}, {"pdf", o.pdfOut}} {
		if out.path == "" {
			continue
		}
		if err := checkOutputPath(out.path); err != nil {
			return &usageError{cmd: "check", msg: fmt.Sprintf("--%s %s: %v", out.flag, out.path, err)}
		}
		abs, err := filepath.Abs(out.path)
		if err != nil {
			return &usageError{cmd: "check", msg: fmt.Sprintf("--%s %s: %v", out.flag, out.path, err)}
		}
		if other, ok := seen[abs]; ok {
			return &usageError{cmd: "check", msg: fmt.Sprintf("--%s and --%s both name %s: give each report its own file", other, out.flag, out.path)}
		}
		seen[abs] = out.flag
	}
	return nil
}

func checkOutputPath(path string) error {
	if st, err := os.Stat(path); err == nil && st.IsDir() {
		return fmt.Errorf("is a folder; give a file name inside it")
	}
	dir := filepath.Dir(path)
	st, err := os.Stat(dir)
	switch {
	case os.IsNotExist(err):
		return fmt.Errorf("folder %s does not exist", dir)
	case err != nil:
		return err
	case !st.IsDir():
		return fmt.Errorf("%s is not a folder", dir)
	}
	// Only creating a file tells for sure (permissions, read-only mounts, ACLs).
	f, err := os.CreateTemp(dir, ".welfare-write-test-*")
	if err != nil {
		return fmt.Errorf("cannot write in folder %s", dir)
	}
	name := f.Name()
	f.Close()
	return os.Remove(name)
}

// writeFile writes a report to a temporary file in the same folder, syncs
// it and renames it over path, so a run that fails or is interrupted never
// leaves a file that looks complete, and the previous file stays until the
// new one is whole. Every error counts, including the one a full disk gives
// only at Sync or Close.
func writeFile(ctx context.Context, path string, write func(io.Writer) error) (err error) {
	f, err := os.CreateTemp(filepath.Dir(path), "."+filepath.Base(path)+".tmp-*")
	if err != nil {
		return err
	}
	tmp := f.Name()
	defer func() {
		if err != nil {
			f.Close()
			os.Remove(tmp)
			err = fmt.Errorf("%s: %w (the previous file, if any, is unchanged)", path, err)
		}
	}()
	bw := bufio.NewWriter(f)
	if err = write(bw); err != nil {
		return err
	}
	if err = bw.Flush(); err != nil {
		return err
	}
	if err = f.Sync(); err != nil {
		return err
	}
	if err = f.Close(); err != nil {
		return err
	}
	if err = os.Chmod(tmp, outputMode(path)); err != nil {
		return err
	}
	if err = ctx.Err(); err != nil {
		return err
	}
	return os.Rename(tmp, path)
}

// outputMode keeps the mode of the file being replaced; a new report is
// readable by all, as os.Create would make it under the usual umask.
func outputMode(path string) os.FileMode {
	if st, err := os.Stat(path); err == nil {
		return st.Mode().Perm()
	}
	return 0o644
}
