package records

// CPUTime is cpuTime for the package's external tests (benchmarks).
var CPUTime = cpuTime
