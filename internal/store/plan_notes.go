package store

import "strings"

// PlanNotes are the dietitian's notes to the athlete on a plan version: one
// for the whole plan and one per day. They reach the athlete's phone page
// and the athlete's sheet as written; like the version's figures they are
// written while it is a draft and frozen once it is published.
type PlanNotes struct {
	Plan string            `json:"plan,omitempty"`
	Days map[string]string `json:"days,omitempty"` // by plan date, YYYY-MM-DD
}

// Longest notes, in characters: a few short paragraphs for the plan, a few
// lines for a day, so that the phone page and sheet stay readable.
const (
	PlanNoteMax = 1500
	DayNoteMax  = 400
)

// Day returns the note on a date, "" when there is none.
func (n PlanNotes) Day(date string) string { return n.Days[date] }

// Empty reports whether there is no note at all.
func (n PlanNotes) Empty() bool {
	if strings.TrimSpace(n.Plan) != "" {
		return false
	}
	for _, d := range n.Days {
		if strings.TrimSpace(d) != "" {
			return false
		}
	}
	return true
}
