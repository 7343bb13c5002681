package server

import (
	"net/url"
	"strconv"
	"strings"
	"unicode/utf8"

	"larder/internal/mass"

	"larder/internal/forms"
	"larder/internal/fuel"
	"larder/internal/store"
)

// Notes to the athlete in the plan builder: one box for the whole plan and
// one per day, posted with the draft's other inputs and saved with the
// version. They are named
//
//	note_plan             the note on the whole plan
//	note_day_2027-04-16   the note on one day

const planNoteName = "note_plan"

const dayNotePrefix = "note_day_"

func dayNoteName(date string) string { return dayNotePrefix + date }

func isNoteInput(name string) bool {
	return name == planNoteName || strings.HasPrefix(name, dayNotePrefix)
}

// versionValues are a version's saved inputs: its overrides and its notes.
func versionValues(v store.PlanVersion, u mass.Unit) forms.Form {
	f := overrideValues(v.Request, u)
	if v.Notes.Plan != "" {
		f.Values.Set(planNoteName, v.Notes.Plan)
	}
	for date, n := range v.Notes.Days {
		if n != "" {
			f.Values.Set(dayNoteName(date), n)
		}
	}
	return f
}

// decodeNotes reads the note inputs of a posted form into notes for plan;
// nil when the form carried none (the version's notes then stay). Each
// note too long, or holding text that cannot be stored, gets its message.
func decodeNotes(values url.Values, plan fuel.Plan, f *forms.Form) *store.PlanNotes {
	seen := false
	for name := range values {
		if isNoteInput(name) {
			seen = true
		}
	}
	if !seen {
		return nil
	}
	check := func(name string, max int) string {
		raw := values.Get(name)
		text := strings.TrimSpace(strings.ReplaceAll(raw, "\r\n", "\n"))
		switch {
		case forms.BadText(raw):
			f.Errors.Add(name, forms.BadTextMessage)
		case utf8.RuneCountInString(text) > max:
			f.Errors.Add(name, "Keep the note to "+strconv.Itoa(max)+" characters or fewer (it has "+strconv.Itoa(utf8.RuneCountInString(text))+"), so that it reads well on a phone.")
		default:
			return text
		}
		return ""
	}
	n := &store.PlanNotes{Plan: check(planNoteName, store.PlanNoteMax)}
	for _, d := range plan.Days {
		if t := check(dayNoteName(d.Date), store.DayNoteMax); t != "" {
			if n.Days == nil {
				n.Days = map[string]string{}
			}
			n.Days[d.Date] = t
		}
	}
	return n
}

// noteLabel names a note input in words, for values carried to a new version.
func noteLabel(name string) string {
	if name == planNoteName {
		return "Note to the athlete on the whole plan"
	}
	return "Note to the athlete on " + dayWords(strings.TrimPrefix(name, dayNotePrefix))
}
