package main

import (
	"bytes"
	"fmt"
	"io"
	"os"

	"welfare/rules"
)

// runLimits prints the built-in limits for a committee to copy and edit, or
// checks an edited file the same strict way check reads it.
func runLimits(args []string, stdout, stderr io.Writer) error {
	if len(args) == 0 || args[0] == "show" {
		_, err := stdout.Write(rules.DefaultLimits())
		return err
	}
	if args[0] == "check" {
		if len(args) != 2 {
			return usagef("limits check needs one FILE")
		}
		b, err := os.ReadFile(args[1])
		if err != nil {
			return err
		}
		l, err := rules.LoadLimits(bytes.NewReader(b), args[1])
		if err != nil {
			return err
		}
		fmt.Fprintf(stdout, "%s: valid; species profiles: %v\n", args[1], l.SpeciesCodes())
		return nil
	}
	return usagef("limits: unknown verb %q (show or check)", args[0])
}
