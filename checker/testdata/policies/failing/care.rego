# METADATA
# title: Failing-test fixture
# description: A rule and two tests, one of which is wrong on purpose.
# scope: package
# custom:
#   subjects: [enclosure]
package welfare.care

# METADATA
# title: Observation missed
# description: Always fires, for the failing-test fixture.
# custom:
#   id: care.observation.missed
#   severity: minor
#   source: common practice
findings contains {"check": "care.observation.missed", "subject": input.id, "on": "2026-01-01", "message": "x", "evidence": []}
