package demo

// The veterinary corrections' plantings (checks.md "Corrections to the
// first set" and "protocol — additions"): one instance of each new or
// changed finding, hooked into generate and writeTables.

// vetCatalogue are the protocol additions, in checks.md order; they follow
// protocol.expiring in the answer key.
var vetCatalogue = []string{"protocol.species.unapproved", "protocol.personnel.unlisted", "protocol.review.overdue"}

// vetStation adds a late-born fox cub alone in an undersized spare cage (no
// fox cage below 0.8 m², whatever its occupants) and a second dog kept in an
// outdoor run of the S4 yard without a nest box (9 CFR §3.4(b): shelter).
func (s *scenario) vetStation() {
	s.enclosures = append(s.enclosures,
		enclosure{id: "S4-25", building: "S4", kind: "cage", lengthCm: 100, widthCm: 70, heightCm: 75, maxOcc: 1, nestBox: "yes", platform: "yes"},
		enclosure{id: "K-02", building: "S4", kind: "run", lengthCm: 200, widthCm: 150, heightCm: 180, maxOcc: 1, nestBox: "no", platform: "no"},
	)
	s.animals = append(s.animals,
		animal{id: "RF-425", species: "vulpes_vulpes", sex: "f", born: "2025-08-28", arrived: "2025-08-28", encl: "S4-25",
			mass: 3.9, length: 52, stage: "juvenile"},
		animal{id: "DG-02", species: "canis_familiaris", sex: "m", born: "2020-04-02", arrived: "2023-09-01", encl: "K-02",
			mass: 24, length: 70},
	)
}

// minCage is the shipped limits' min_cage_m2 per species (checks.md
// "Corrections to the first set"; Czech Decree 208/2004 and Finnish Decree
// 1084/2011 as implementations of the Council of Europe recommendation).
var minCage = map[string]float64{"vulpes_vulpes": 0.8, "vulpes_lagopus": 0.8, "neogale_vison": 0.255}

// vetStaff: Ruben (ST-08) completed his rabies series after joining, so his
// care rounds are protected; Mira (ST-10), a visiting researcher, has none.
func (s *scenario) vetStaff() {
	for i := range s.staff {
		switch s.staff[i].id {
		case "ST-08":
			s.staff[i].primary = "2025-10-13"
		case "ST-01":
			s.staff[i].riskCategory = "3" // written out; the others take the limits' category
		}
	}
	s.staff = append(s.staff, person{id: "ST-10", name: "Mira Okonkwo-Lindqvist", role: "other", from: "2025-11-03", handling: "2025-11-05"})
}

// vetRounds: Mira helps with one evening round of a fox cage on Jan 28.
func (s *scenario) vetRounds() {
	s.rounds = append(s.rounds, round{at: at(28, 16, 40), encl: "S4-03", staff: "ST-10", observed: "yes", water: "ok",
		notes: "helped with the evening round"})
	s.plant("staff.rabies.unprotected", "ST-10", janDate(28), "",
		"Mira (ST-10) has no rabies pre-exposure series and did a care round of fox cage S4-03 on Jan 28: care rounds of occupied enclosures are rabies-risk work too.")
}

// vetHandling are the handling rows of the protocol additions.
func (s *scenario) vetHandling() []handlingRow {
	// A red fox weighed under the arctic-fox protocol, for a coat comparison.
	rf := fox(at(21, 14, 40), "RF-310", "ST-03", "weighing", 3)
	rf.protocol = "BFR-AF-02"
	s.plant("protocol.species.unapproved", "BFR-AF-02", janDate(21), "",
		"Red fox RF-310 was weighed on Jan 21 on a row naming BFR-AF-02, which approves only vulpes_lagopus.")
	// A mink checked under the nest-use protocol, whose last continuing review was in 2022.
	nv := handlingRow{at: at(23, 14, 0), animal: "NV-03", staff: "ST-07", purpose: "health_check", restraint: "gloved_hand",
		minutes: 2, glove: "bite_resistant", gloveID: "GL-07", thickness: 3.0, ppe: "coverall", protocol: "BFR-NV-03"}
	s.plant("protocol.review.overdue", "BFR-NV-03", janDate(23), "",
		"NV-03 had a health check on Jan 23 under BFR-NV-03, whose last continuing review was on 2022-11-10: more than 36 months before.")
	return []handlingRow{rf, nv}
}

// vetProtocolColumns are protocols.csv's personnel, last_reviewed_on and
// pain_category for each protocol, and the nest-use protocol's own row.
func (s *scenario) vetProtocolColumns(id string) []string {
	switch id {
	case "BFR-RF-01":
		s.plant("protocol.personnel.unlisted", "BFR-RF-01", janDate(16), "",
			"Mira (ST-10) temperament-tested RF-406 on Jan 16 under BFR-RF-01, whose personnel list does not name her.")
		return []string{"ST-01;ST-02;ST-03;ST-04;ST-05;ST-06;ST-07;ST-08;ST-09", "", "C"}
	case "BFR-AF-02":
		return []string{"", "2025-02-10", "C"}
	case "BFR-NV-03":
		return []string{"ST-02;ST-03;ST-07", "2022-11-10", "B"}
	}
	return []string{"", "", ""}
}

// vetCullHow is the potassium chloride plant's description: sedation alone
// no longer meets the condition (checks.md, AVMA 2020 [M]).
const vetCullHow = "AF-06 was given potassium chloride after sedation only (sedated: yes, anaesthetised not recorded); potassium chloride is acceptable only under general anaesthesia."

// vetNotes explain the corrections' plantings that the table does not show.
var vetNotes = []string{
	"RF-425, a late-born cub (life_stage juvenile, 0.6 m²), lives alone in spare cage S4-25 of 0.70 m²: enclosure.space.insufficient because no fox cage may be below 0.8 m² (min_cage_m2), whatever its occupants.",
	"DG-02 lives in run K-02 of the outdoor S4 yard without a nest box: cold.shelter.missing on its hard-cold days (9 CFR §3.4(b); a sheltered building would count as shelter). Its bedding goes in with the yard's (every 3–4 days), so the dogs' below-10 °C bedding limit (§3.4(b)(4)) gives no finding here; the rule and facts tests cover it.",
	"AF-06's potassium chloride cull was recorded with sedated: yes, which no longer meets the condition: cull.method.conditions_unmet.",
}

// vetRequiredArea is the area an occupant needs and the smallest cage its
// species may have, with the default limits.
func vetRequiredArea(a *animal) (need, cage float64) {
	need = requiredArea(a)
	if a.stage == "juvenile" {
		switch a.species {
		case "vulpes_vulpes", "vulpes_lagopus":
			need = 0.6
		case "neogale_vison":
			need = 0.1275
		}
	}
	return need, minCage[a.species]
}

func init() { gloveOf["ST-10"] = "GL-10" }
