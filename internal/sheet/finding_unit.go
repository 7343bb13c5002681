package sheet

import (
	"strings"

	"larder/internal/fuel"
	"larder/internal/mass"
)

// FindingMessage is a finding's message with each body mass it names (the
// engine records them in kg beside the text around them) written in the
// client's unit: an athlete weighed in pounds reads the expected gain from
// loading, or an estimated fat-free mass, in pounds on the plan page and
// both sheets alike. A single figure is shown to 0.1 of the unit, a range as
// mass.Difference gives it. A finding stored without its figures keeps its
// kg message.
func FindingMessage(fd fuel.Finding, u mass.Unit) string {
	if len(fd.Masses) == 0 || len(fd.MassText) != len(fd.Masses)+1 {
		return fd.Message
	}
	var b strings.Builder
	for i, m := range fd.Masses {
		b.WriteString(fd.MassText[i])
		if m.MaxKg != 0 {
			b.WriteString(mass.Difference(m.Kg, m.MaxKg, u))
		} else {
			b.WriteString(mass.Text(m.Kg, u))
		}
	}
	b.WriteString(fd.MassText[len(fd.Masses)])
	return b.String()
}
