package web

func hasDayNote(v PlanView) bool {
	for _, d := range v.Days {
		if v.Form.Get(dayNoteInputPfx+d.Date) != "" {
			return true
		}
	}
	return false
}

func hasAnyNote(v PlanView) bool { return v.Form.Get(planNoteInput) != "" || hasDayNote(v) }
