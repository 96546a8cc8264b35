//go:build !unix

package main

import "time"

// cpuTime is not measured here: --timings leaves the CPU column out.
func cpuTime() (time.Duration, bool) { return 0, false }
