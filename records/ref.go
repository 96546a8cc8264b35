package records

import (
	"fmt"
	"strconv"
	"strings"
)

// ParseRef splits a ref "FILE:LINE" into its file and line. The file is
// what comes before the last colon and must not be empty; the line is a
// decimal number from 1 (no sign, no leading zero).
func ParseRef(s string) (file string, line int, err error) {
	i := strings.LastIndexByte(s, ':')
	if i <= 0 {
		return "", 0, fmt.Errorf("%s is not a record reference (FILE:LINE)", shortQuote(s))
	}
	num := s[i+1:]
	if num == "" || len(num) > 10 || num[0] == '0' {
		return "", 0, fmt.Errorf("%s is not a record reference: the line after the colon is not a number from 1", shortQuote(s))
	}
	n, ok := digits(num, 0, len(num))
	if !ok {
		return "", 0, fmt.Errorf("%s is not a record reference: the line after the colon is not a number from 1", shortQuote(s))
	}
	return s[:i], n, nil
}

// MakeRef is the ref of a file's line.
func MakeRef(file string, line int) Ref { return Ref(file + ":" + strconv.Itoa(line)) }
