package sheet

import (
	"fmt"
	"strings"

	"larder/internal/fuel"
	"larder/internal/mass"
)

// FindingMessage is a finding's message with the body-mass figures the
// engine wrote in kg given in the client's unit. The engine works in kg
// only; of its findings, the expected gain from loading is the one that
// names a body mass, so an athlete weighed in pounds reads it in pounds on
// the plan page and both sheets alike.
func FindingMessage(fd fuel.Finding, p fuel.Plan, u mass.Unit) string {
	if u == mass.KG || fd.Code != "mass-gain" || p.ExpectedMassGainKg == nil || p.ExpectedMassGainKgMax == nil {
		return fd.Message
	}
	lo, hi := *p.ExpectedMassGainKg, *p.ExpectedMassGainKgMax
	kg := fmt.Sprintf("%g–%g kg", lo, hi)
	return strings.Replace(fd.Message, kg, mass.Difference(lo, hi, u), 1)
}
