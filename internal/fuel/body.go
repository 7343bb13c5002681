package fuel

import "math"

// Body is the body-composition picture the other models use.
type Body struct {
	Sex           string
	MassKg        float64
	FFMKg         float64 // 0 when unknown
	FFMMethod     string
	SkeletalKg    float64 // skeletal muscle mass (Janssen et al. 2000 shares)
	WorkingKg     float64 // the muscle doing the work for the modality
	LiverCapG     float64 // liver glycogen when full and fed
	VO2max        float64 // ml/kg/min, 0 when unknown
	WorkingMethod string
	// BoerKg is the Boer estimate when height was given but the estimate
	// is unusable (not above 0 and below body mass); 0 otherwise.
	BoerKg float64
	// StoresBasisKg is the body mass the per-kg store shares are applied
	// to: body mass, or, with body fat measured, the mass of a reference
	// body of the same fat-free mass.
	StoresBasisKg float64
}

// BoerLBM is the Boer (1984) lean body mass estimate in kg from mass (kg)
// and height (cm).
func BoerLBM(sex string, massKg, heightCm float64) float64 {
	if sex == "male" {
		return 0.407*massKg + 0.267*heightCm - 19.2
	}
	return 0.252*massKg + 0.473*heightCm - 48.3
}

// NewBody derives body composition for a modality. Fat-free mass comes from
// measured body fat when given, otherwise the Boer estimate from height,
// otherwise it is unknown. Skeletal muscle is a share of body mass by sex;
// the working muscle is the legs (Rapoport's leg share) for running,
// cycling, team and other sports, and a larger share of all skeletal muscle
// for swimming, rowing, skiing and triathlon (model assumption).
func NewBody(a Athlete, modality string) Body {
	b := Body{Sex: a.Sex, MassKg: a.BodyMassKg, FFMMethod: FFMNone}
	switch {
	case a.BodyFatPct != nil:
		b.FFMKg = a.BodyMassKg * (1 - *a.BodyFatPct/100)
		b.FFMMethod = FFMMeasured
	case a.HeightCm != nil:
		b.FFMKg = BoerLBM(a.Sex, a.BodyMassKg, *a.HeightCm)
		b.FFMMethod = FFMBoer
		if b.FFMKg <= 0 || b.FFMKg >= a.BodyMassKg {
			b.BoerKg = b.FFMKg
			b.FFMKg, b.FFMMethod = 0, FFMNone
		}
	}
	muscleShare, legShare, refFat := gMuscleFemale.Min, gLegsFemale.Min, gRefFat.Min
	if a.Sex == "male" {
		muscleShare, legShare, refFat = gMuscleMale.Min, gLegsMale.Min, gRefFat.Max
	}
	// Muscle and liver follow fat-free mass, not fat: with body fat
	// measured, the per-kg shares apply to a reference body of the same
	// fat-free mass (the Boer estimate is itself from mass and height, so
	// it adds nothing here).
	basis := a.BodyMassKg
	if b.FFMMethod == FFMMeasured {
		basis = b.FFMKg / (1 - refFat)
	}
	b.StoresBasisKg = basis
	b.SkeletalKg = basis * muscleShare
	switch modality {
	case "swim":
		b.WorkingKg = b.SkeletalKg * gWorkSwim.Min
		b.WorkingMethod = "swimming share of skeletal muscle"
	case "row", "ski":
		b.WorkingKg = b.SkeletalKg * gWorkRow.Min
		b.WorkingMethod = "rowing/skiing share of skeletal muscle"
	case "triathlon":
		b.WorkingKg = b.SkeletalKg * gWorkTri.Min
		b.WorkingMethod = "triathlon share of skeletal muscle"
	default:
		b.WorkingKg = basis * legShare
		b.WorkingMethod = "leg muscle"
	}
	b.LiverCapG = gModelLiver.Min * basis
	if a.VO2maxMlKgMin != nil {
		b.VO2max = *a.VO2maxMlKgMin
	}
	return b
}

// GlycogenG converts a muscle glycogen density (mmol glucosyl units per kg
// wet muscle) over a muscle mass into grams: 0.162 g per mmol.
func GlycogenG(densityMmolPerKg, muscleKg float64) float64 {
	return densityMmolPerKg * muscleKg * gGlucosyl.Min
}

// WaterWithGlycogenG is the water stored with a mass of glycogen (3 g/g).
func WaterWithGlycogenG(glycogenG float64) float64 { return glycogenG * gWater.Min }

// WeirKcal is energy expenditure from gas exchange (litres of O2 consumed
// and CO2 produced), protein ignored.
func WeirKcal(vo2L, vco2L float64) float64 { return gWeir.Min*vo2L + gWeir.Max*vco2L }

// FraynCHO is carbohydrate oxidation in g/min from VO2 and VCO2 in L/min.
func FraynCHO(vo2, vco2 float64) float64 { return gFraynCho.Min*vco2 - gFraynCho.Max*vo2 }

// FraynFat is fat oxidation in g/min from VO2 and VCO2 in L/min.
func FraynFat(vo2, vco2 float64) float64 { return gFraynFat.Min*vo2 - gFraynFat.Max*vco2 }

// AtwaterKcal is the energy of carbohydrate, protein and fat grams.
func AtwaterKcal(choG, proteinG, fatG float64) float64 {
	return gAtwaterCho.Min*choG + gAtwaterProt.Min*proteinG + gAtwaterFat.Min*fatG
}

// ChoShare is the share of energy from carbohydrate at an intensity in
// %VO2max: a line through the published shape (≈25%: small, ≈65%: about
// half, ≈85%: about three quarters), continued with the upper slope and
// held between 0.05 and 0.95.
func ChoShare(pctVO2max float64) float64 {
	var s float64
	p25, p65, p85 := gShare25.Min, gShare65.Min, gShare85.Min
	switch {
	case pctVO2max <= p25:
		s = gShare25.Max
	case pctVO2max <= p65:
		s = gShare25.Max + (pctVO2max-p25)*(gShare65.Max-gShare25.Max)/(p65-p25)
	default:
		s = gShare65.Max + (pctVO2max-p65)*(gShare85.Max-gShare65.Max)/(p85-p65)
	}
	return math.Max(gShareClamp.Min, math.Min(gShareClamp.Max, s))
}

// kcalPerLitreO2 is the Weir energy of one litre of oxygen at the RER that
// a carbohydrate share implies (non-protein RER ≈ 0.7 + 0.3 × share).
func kcalPerLitreO2(share float64) float64 {
	rer := gRER.Min + (gRER.Max-gRER.Min)*share
	return WeirKcal(1, rer)
}

// intensityPct turns a session intensity into %VO2max: easy 50, moderate 65,
// hard 80, rpe:N → 40 + 5N, pct:N → N (model assumption).
func intensityPct(in Intensity) float64 {
	switch in.Word {
	case "easy":
		return gEasy.Min
	case "hard":
		return gHard.Min
	case "rpe":
		return gRPE.Min + gRPE.Max*in.N
	case "pct":
		return in.N
	}
	return gModerate.Min
}

// metAt interpolates a modality's MET value at %VO2max: easy at 50, the
// midpoint at 65, hard at 80 and beyond (held).
func metAt(modality string, pct float64) float64 {
	g := metTable[modality]
	if g.Key == "" {
		g = metTable["other"]
	}
	// The table's easy, moderate and hard values sit at the intensities a
	// session logged as easy, moderate and hard is taken to be.
	mid := (g.Min + g.Max) / 2
	easy, mod, hard := gEasy.Min, gModerate.Min, gHard.Min
	switch {
	case pct <= easy:
		return g.Min
	case pct <= mod:
		return g.Min + (pct-easy)*(mid-g.Min)/(mod-easy)
	case pct <= hard:
		return mid + (pct-mod)*(g.Max-mid)/(hard-mod)
	}
	return g.Max
}

var metTable = func() map[string]Guideline {
	m := map[string]Guideline{}
	for _, mod := range []string{"run", "cycle", "swim", "row", "ski", "triathlon", "team", "strength", "other"} {
		m[mod] = metFor(mod)
	}
	return m
}()

// sessionKcalPerH is the energy rate of exercise: from VO2max at the
// intensity (Weir) when VO2max is known, otherwise METs × body mass
// (1 MET ≈ 1 kcal/kg/h).
func sessionKcalPerH(b Body, modality string, pct float64) float64 {
	if b.VO2max > 0 {
		vo2LPerMin := b.VO2max * pct / 100 * b.MassKg / 1000
		return vo2LPerMin * 60 * kcalPerLitreO2(ChoShare(pct))
	}
	return metAt(modality, pct) * gMET.Min * b.MassKg
}

// defaultRaceIntensity is %VO2max by event duration when none is given.
func defaultRaceIntensity(min float64) float64 {
	for _, g := range raceIntensity {
		if min <= g.Min {
			return g.Max
		}
	}
	return raceIntensity[len(raceIntensity)-1].Max
}

// raceIntensity is the model.race-intensity.N rows, shortest first.
var raceIntensity = func() (out [7]Guideline) {
	for i := range out {
		out[i] = guideline("model.race-intensity." + string(rune('0'+i)))
	}
	return out
}()

// EventEnergy is the energy of an event in kcal and how it was found:
// running ≈ 1 kcal/kg/km over the distance; cycling from mechanical work
// (mean power × time) at ≈ 24% gross efficiency; otherwise from VO2max at
// the intensity (Weir) or METs.
func EventEnergy(b Body, e Event, pct float64) (kcal float64, method string) {
	h := e.ExpectedDurationMin / 60
	switch {
	case e.Modality == "run" && e.DistanceKm != nil:
		return gRunCost.Min * b.MassKg * *e.DistanceKm, "running cost 1 kcal/kg/km"
	case e.Modality == "cycle" && e.AveragePowerW != nil:
		workKJ := *e.AveragePowerW * e.ExpectedDurationMin * 60 / 1000
		return workKJ / gCycleEff.Min / gKJPerKcal.Min, "mechanical work at 24% efficiency"
	case b.VO2max > 0:
		return sessionKcalPerH(b, e.Modality, pct) * h, "VO2max at the race intensity (Weir)"
	}
	return sessionKcalPerH(b, e.Modality, pct) * h, "METs at the race intensity"
}
