package welfare.care_test

import data.welfare.care

test_fires_once if {
	count(care.findings) == 1 with input as {"id": "E-01"}
}

# Wrong on purpose: the rule fires, so this test must be reported as FAIL.
test_never_fires if {
	count(care.findings) == 0 with input as {"id": "E-01"}
}
