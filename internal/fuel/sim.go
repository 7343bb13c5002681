package fuel

import (
	"math"
	"time"
)

// The glycogen model, in brief (every figure is in the Guidelines table):
//
//   - Three stores: glycogen of the working muscle and of the other
//     skeletal muscle (densities in mmol glucosyl/kg wet muscle) and liver
//     glycogen in grams, plus a gut pool of eaten carbohydrate.
//   - The gut delivers first-order with a 1.5 h time constant, at most
//     105 g/h: the exogenous oxidation ceiling of multiple transportable
//     carbohydrate, 1.75 g/min (Jeukendrup 2014), so a pre-event meal is
//     mostly absorbed by the start and recovery feeds keep pace.
//   - Resting and daily-living carbohydrate use is 0.17 g/kg/h at typical
//     stores and scales with stores/typical, so the intake sets the
//     level stores settle at (model assumption). The liver takes 30% of
//     what is absorbed on first pass (model assumption), the rest covers
//     that use first, then muscle synthesis what it can, the liver what is
//     left. When fasted,
//     the liver (the main source of blood glucose for 8–12 h after a meal,
//     common practice) gives up glycogen at a rate set so that a 10–12 h
//     overnight fast lowers it by roughly a third to a half (common
//     practice); gluconeogenesis supplies the rest of its glucose output.
//     Muscle covers 30% of what is still
//     uncovered (daily living, model assumption) and fat the rest.
//   - Below a fifth of its capacity the liver gives up glycogen ever more
//     slowly, in proportion to what is left, and in exercise
//     gluconeogenesis supplies up to 0.1 g/kg/h of its output (model
//     assumptions): liver glycogen falls but does not run dry in a fasted
//     morning session.
//   - Muscle synthesis has two parts. The post-exercise window of the
//     working muscle (synthRate) is the product of emptiness (slowing as
//     the fourth root of the room left to the 220 mmol/kg capacity), the
//     window and the glucose supply (x/(x+0.4) of the carbohydrate
//     absorbed in g/kg/h; more at 1.2 than at 0.8 g/kg/h, Ivy 2004). The
//     window has a rapid phase (all but 35% of the early rate, decaying
//     with a 1.5 h time constant; Ivy 1988) over a slow one that fades
//     over a day or two (time constant 24 h; Jentjens & Jeukendrup 2003:
//     raised insulin sensitivity lasts many hours). A near-maximal bout
//     recruits the type II fibres too, about as many again as a submaximal
//     one, and their raised synthesis adds to the slow phase. As the slow
//     phase fades, resting synthesis takes over (restRate): in all muscle
//     alike, whether it worked or not, driven by the same glucose supply
//     and slowing to nothing as the density nears the level recent intake
//     sets: the typical density times the carbohydrate absorbed over the
//     last day or so over resting use (Bergström 1967, from memory: low,
//     mixed and high carbohydrate diets leave low, typical and high
//     stores). So 5 g/kg a day with no training holds stores in the
//     typical band, and 10 g/kg a day at rest loads them within two or
//     three days (Bussau 2002, from memory). The constants are checked
//     against the studies in calibration_test.go.
//     Supply beyond what muscle and liver can take is oxidised or stored
//     as fat. Exercise and daily living take working muscle down to the
//     depleted floor (25 mmol/kg), not below.
//   - During exercise, carbohydrate use is the energy rate × the share of
//     carbohydrate at the intensity ÷ 4 kcal/g. Eaten carbohydrate covers
//     at most 35% of that use at hard efforts (≥ 67% VO2max ≈ 80% of
//     maximum heart rate, common practice) rising to 60% at easy ones; the
//     rest comes 80% from working-muscle glycogen and 20% from the liver,
//     each taking over when the other is empty (or, for the liver, near
//     empty). The stores "run out" when
//     both are empty.

// simBody holds the constants of one athlete's simulation.
type simBody struct {
	workingKg, otherKg float64
	massKg             float64
	liverCapG          float64
	restOxGPerH        float64 // at typical stores
	liverDrainGPerH    float64 // fasting glycogen output of the liver
	liverFloorG        float64 // below this the liver's glycogen output slows
	gngGPerH           float64 // gluconeogenesis in exercise
	gutGPerH           float64
	// needGPerH is resting and daily-living carbohydrate use at typical
	// stores: the intake that holds resting muscle at the typical density.
	needGPerH float64

	// per-step constants of the last dt (the simulation uses few step sizes)
	stepDt, gutFrac, boostDecay, slowDecay, intakeFrac float64
}

func newSimBody(b Body) simBody {
	other := b.SkeletalKg - b.WorkingKg
	if other < 0 {
		other = 0
	}
	return simBody{
		workingKg:   b.WorkingKg,
		otherKg:     other,
		massKg:      b.MassKg,
		liverCapG:   b.LiverCapG,
		restOxGPerH: gRestOx.Min * b.MassKg,
		needGPerH:   gRestOx.Min * b.MassKg,
		// The fasting liver gives up the overnight fall's upper end (half)
		// over the fast's middle hours (11 of 10–12) less the first two
		// gut time constants (3 h), in which the evening meal is still
		// being absorbed (86% of it); with that absorption, the modelled fall from the
		// evening's peak to breakfast lands inside a third to a half.
		liverDrainGPerH: gOvernightFall.Max * b.LiverCapG /
			((gOvernightHours.Min+gOvernightHours.Max)/2 - gModelGut.Max),
		liverFloorG: gLiverFloor.Min * b.LiverCapG,
		gngGPerH:    gGluconeogenesis.Min * b.MassKg,
		gutGPerH:    gModelGut.Min,
	}
}

// simState is the state of the stores at one moment.
type simState struct {
	Dw, Do float64 // working and other muscle glycogen, mmol/kg wet muscle
	LiverG float64
	GutG   float64
	// sinceExH is the time since the working muscle last exercised, hours;
	// boostLeft is exp(−sinceExH/τ) of the post-exercise window, kept
	// step by step.
	sinceExH  float64
	boostLeft float64
	// windowLeft is exp(−sinceExH/τ) of the slow phase of the window: the
	// raised synthesis of the muscle that worked fades over a day or two.
	windowLeft float64
	// IntakeGPerH is the carbohydrate absorbed lately, g/h, averaged with
	// the time constant of model.rest-level: the intake resting muscle
	// stores answer to.
	IntakeGPerH float64
	// slowLeft is the slow phase: the fibres a near-maximal bout recruited
	// beyond a submaximal one's (type II as well as type I), relative to
	// those, times exp(−sinceExH/τ); 0 after submaximal exercise only.
	slowLeft float64
}

// since sets the time since the working muscle last exercised.
func (s simState) since(h float64) simState {
	s.sinceExH = h
	s.boostLeft = math.Exp(-h / gModelBoost.Max)
	s.windowLeft = math.Exp(-h / gModelSlow.Max)
	s.slowLeft = 0
	return s
}

func (b simBody) muscleG(s simState) float64 {
	return GlycogenG(s.Dw, b.workingKg) + GlycogenG(s.Do, b.otherKg)
}

func (b simBody) workingG(s simState) float64 { return GlycogenG(s.Dw, b.workingKg) }

// synthRate is the synthesis rate of the working muscle's post-exercise
// window in mmol/kg/h at density d, as the product of three mechanisms:
// emptiness (glycogen synthase is most active in empty muscle; the rate
// slows as the fourth root of the room left, to zero at the capacity
// density), the window w (window) and the supply of glucose (xGPerKgH, the
// carbohydrate absorbed in g per kg body mass per hour: synthesis rises
// with intake towards a plateau near 1.2 g/kg/h, Ivy 2004).
func synthRate(d, w, xGPerKgH float64) float64 {
	capD, lowD := gModelCapacity.Min, gDepleted.Min
	g := (capD - d) / (capD - lowD)
	if g <= 0 || xGPerKgH <= 0 || w <= 0 {
		return 0
	}
	g = math.Sqrt(math.Sqrt(min(g, 1)))
	return gResynthPeak.Min * g * w * supplyShare(xGPerKgH)
}

// supplyShare is x/(x+K) of the carbohydrate absorbed, g/kg/h.
func supplyShare(xGPerKgH float64) float64 { return xGPerKgH / (xGPerKgH + gModelSupply.Min) }

// window is the post-exercise window of the working muscle, as a share of
// the rate just after exercise: a rapid phase (boostLeft: 1 just after
// exercise, decaying in hours; Ivy 1988) over a slow one (the raised
// insulin sensitivity of the muscle that worked, fading over a day or two,
// Jentjens & Jeukendrup 2003), the slow one larger after a near-maximal
// bout by the extra fibres it recruited (slowLeft).
func (s simState) window() float64 {
	rested := gModelBoost.Min
	return rested*(s.windowLeft+s.slowLeft) + (1-rested)*s.boostLeft
}

// restLevel is the density resting muscle settles at on the intake of
// late: the typical density times recent intake over resting use (a diet
// with no carbohydrate leaves muscle depleted, a mixed one typical, a high
// one loaded: Bergström 1967, from memory), at most the capacity.
func (b *simBody) restLevel(s *simState) float64 {
	if b.needGPerH <= 0 {
		return gModelTypical.Min
	}
	return min(gModelCapacity.Min, gModelTypical.Min*s.IntakeGPerH/b.needGPerH)
}

// restRate is resting synthesis in mmol/kg/h at density d, in any muscle:
// driven by the supply of glucose, slowing as the density approaches the
// level recent intake sets (restLevel), none above it.
func restRate(d, level, xGPerKgH float64) float64 {
	if d >= level || xGPerKgH <= 0 {
		return 0
	}
	room := min(1, (level-d)/(level-gDepleted.Min))
	return gResynthPeak.Min * gRestSynth.Min * math.Pow(room, gRestSynth.Max) * supplyShare(xGPerKgH)
}

// recruitShare is the share of the working muscle's fibres a bout at pct
// %VO2max recruits, relative to a submaximal bout: submaximal exercise
// recruits mainly the type I fibres (about half of them), near-maximal
// exercise all fibre types, twice the fibres (Fairchild 2002: after a
// near-maximal bout glycogen rose alike in type I, IIa and IIb fibres).
func recruitShare(pct float64) float64 {
	if pct >= gRecruit.Min {
		return 1 / gRecruit.Max
	}
	return 1
}

// coverShare is the share of carbohydrate use that eaten carbohydrate can
// cover at an intensity.
func coverShare(pct float64) float64 {
	hard, easy := gHardCover.Min, gCoverEasy.Min
	lo, hi := gCoverPct.Min, gCoverPct.Max
	switch {
	case pct >= hi:
		return hard
	case pct <= lo:
		return easy
	}
	return easy + (pct-lo)*(hard-easy)/(hi-lo)
}

// exercise is one bout in the simulation.
type exercise struct {
	start, end    int64 // unix seconds
	choUseGPerH   float64
	cover         float64
	intakeGPerH   float64 // eaten continuously during the bout (in-event fuelling)
	recruit       float64 // fibres recruited, relative to a submaximal bout (recruitShare)
	isEvent       bool
	runsOutAfterH float64 // set by the simulation: hours into the bout the stores ran out, −1 if never
}

// intake is carbohydrate eaten at one moment.
type intake struct {
	at int64
	g  float64
}

// step advances the state by dt hours. use is the carbohydrate use of
// exercise in g/h (0 at rest); recruit is the share of the working
// muscle's fibres the exercise recruits, relative to a submaximal bout
// (recruitShare). It returns the grams of carbohydrate the stores could
// not supply.
func (b *simBody) step(s *simState, dt, use, cover, eatGPerH, recruit float64) (short float64) {
	if dt != b.stepDt {
		b.stepDt = dt
		b.gutFrac = 1 - math.Exp(-dt/gModelGut.Max)
		b.boostDecay = math.Exp(-dt / gModelBoost.Max)
		b.slowDecay = math.Exp(-dt / gModelSlow.Max)
		b.intakeFrac = 1 - math.Exp(-dt/gRestLevel.Max)
	}
	s.GutG += eatGPerH * dt
	// The gut delivers first-order (time constant gModelGut.Max), at most
	// gutGPerH: the exogenous oxidation ceiling of mixed carbohydrate.
	a := min(s.GutG*b.gutFrac, b.gutGPerH*dt)
	s.GutG -= a
	s.IntakeGPerH += (a/dt - s.IntakeGPerH) * b.intakeFrac
	if use > 0 {
		c := use * dt
		exo := min(a, cover*c)
		a -= exo
		e := c - exo
		// Working muscle gives glycogen down to the depleted floor, not
		// below: the depleted state studies measure is 25–40 mmol/kg.
		wG := GlycogenG(max(0, s.Dw-gDepleted.Min), b.workingKg)
		fromM := gModelMuscleFr.Min * e
		fromL := e - fromM
		if fromM > wG {
			fromL += fromM - wG
			fromM = wG
		}
		// The liver's output: gluconeogenesis first, then glycogen, which
		// slows near the floor; what it cannot give falls on the muscle,
		// and what neither can is the shortfall.
		gng := min(fromL, b.gngGPerH*dt)
		want := fromL - gng
		got := b.liverDraw(s.LiverG, want)
		if got < want {
			extra := want - got
			take := min(extra, wG-fromM)
			fromM += take
			short = extra - take
		}
		s.LiverG -= got
		if b.workingKg > 0 {
			s.Dw = max(min(s.Dw, gDepleted.Min), s.Dw-fromM/(b.workingKg*gGlucosyl.Min))
		}
		s.sinceExH = 0
		s.boostLeft = 1
		s.windowLeft = 1
		s.slowLeft = max(s.slowLeft, recruit-1)
		// Left-over absorbed carbohydrate tops up the liver.
		s.LiverG = min(b.liverCapG, s.LiverG+a)
		return short
	}
	s.sinceExH += dt
	s.boostLeft *= b.boostDecay
	s.windowLeft *= b.slowDecay
	s.slowLeft *= b.slowDecay
	// The supply that drives synthesis: all carbohydrate absorbed, per kg
	// body mass per hour.
	x := a / dt / b.massKg
	// First pass: the liver takes its share of what is absorbed. Then
	// resting and daily-living use, covered by absorbed carbohydrate and
	// (up to the fasting drain) by the liver; then muscle synthesis; the
	// liver takes what is left.
	if toLiver := min(gLiverShare.Min*a, b.liverCapG-s.LiverG); toLiver > 0 {
		s.LiverG += toLiver
		a -= toLiver
	}
	// Resting and daily-living use: absorbed carbohydrate first, then the
	// liver (up to its fasting drain), then muscle and fat.
	totalKg := b.workingKg + b.otherKg
	mean := gModelTypical.Min
	if totalKg > 0 {
		mean = (s.Dw*b.workingKg + s.Do*b.otherKg) / totalKg
	}
	r := b.restOxGPerH * mean / gModelTypical.Min * dt
	fromGut := min(a, r)
	a -= fromGut
	r -= fromGut
	if r > 0 {
		d := b.liverDraw(s.LiverG, min(r, b.liverDrainGPerH*dt))
		s.LiverG -= d
		// Daily living draws a share of the rest on muscle glycogen,
		// spread over all muscle; fat covers what remains.
		if m := gDailyMuscle.Min * (r - d); m > 0 && totalKg > 0 {
			dd := m / (totalKg * gGlucosyl.Min)
			fl := gDepleted.Min
			s.Dw, s.Do = max(min(s.Dw, fl), s.Dw-dd), max(min(s.Do, fl), s.Do-dd)
		}
	}
	if a <= 0 {
		return 0
	}
	// Muscle synthesis (rate-limited, shared in proportion to demand);
	// the liver takes what is left.
	k := gGlucosyl.Min * dt
	// Resting synthesis runs in all muscle alike; the working muscle adds
	// its post-exercise window.
	lvl := b.restLevel(s)
	dw := (synthRate(s.Dw, s.window(), x) + (1-s.windowLeft)*restRate(s.Dw, lvl, x)) * b.workingKg * k
	do := restRate(s.Do, lvl, x) * b.otherKg * k
	if need := dw + do; need > a {
		f := a / need
		dw, do = dw*f, do*f
	}
	if b.workingKg > 0 {
		s.Dw += dw / (b.workingKg * gGlucosyl.Min)
	}
	if b.otherKg > 0 {
		s.Do += do / (b.otherKg * gGlucosyl.Min)
	}
	a -= dw + do
	s.LiverG = min(b.liverCapG, s.LiverG+a)
	return 0
}

// liverDraw is how much of want grams the liver's glycogen gives: all of
// it down to the floor, then ever less, in proportion to what is left
// (so the liver approaches empty but does not reach it).
func (b *simBody) liverDraw(liverG, want float64) float64 {
	if want <= 0 || liverG <= 0 {
		return 0
	}
	free := max(0, liverG-b.liverFloorG)
	if want <= free || b.liverFloorG <= 0 {
		return min(want, liverG)
	}
	low := liverG - free
	return free + low*(1-math.Exp(-(want-free)/b.liverFloorG))
}

const simStep = 5 * time.Minute

// simulate runs the stores from `from` to `to` (unix seconds) in 5-minute
// steps over the bouts and intakes (both sorted by time). When curve is not
// nil it gets a point at every multiple of sampleS seconds (the caller adds
// the final point). Bouts record when the stores ran out in them.
func (b *simBody) simulate(s simState, from, to int64, ex []exercise, in []intake, curve *[]GlycogenPoint, sampleS int64, loc *time.Location) simState {
	const dtS = int64(simStep / time.Second)
	ii, ei := 0, 0
	for i := range ex {
		ex[i].runsOutAfterH = -1
	}
	for t := from; t < to; t += dtS {
		dt := simStep.Hours()
		if t+dtS > to {
			dt = float64(to-t) / 3600
		}
		for ii < len(in) && in[ii].at < t+dtS {
			if in[ii].at >= from {
				s.GutG += in[ii].g
			}
			ii++
		}
		for ei < len(ex) && ex[ei].end <= t {
			ei++
		}
		use, cover, eat, rec := 0.0, 0.0, 0.0, 0.0
		if ei < len(ex) && ex[ei].start <= t {
			use, cover, eat, rec = ex[ei].choUseGPerH, ex[ei].cover, ex[ei].intakeGPerH, ex[ei].recruit
		}
		if curve != nil && t%sampleS == 0 {
			*curve = append(*curve, b.point(s, t, loc))
		}
		if short := b.step(&s, dt, use, cover, eat, rec); short > 0 && ex[ei].runsOutAfterH < 0 {
			ex[ei].runsOutAfterH = float64(t-ex[ei].start) / 3600
		}
	}
	return s
}

func (b simBody) point(s simState, t int64, loc *time.Location) GlycogenPoint {
	return GlycogenPoint{
		At:      time.Unix(t, 0).In(loc),
		MuscleG: round1(b.muscleG(s)),
		LiverG:  round1(s.LiverG),
	}
}

// race runs the stores through an event in 1-minute steps at a constant
// carbohydrate use and intake, and returns when they ran out (hours, −1 if
// they lasted) and the state at the finish.
func (b *simBody) race(s simState, durH, useGPerH, cover, eatGPerH float64) (runsOutH float64, end simState) {
	const dt = 1.0 / 60
	runsOutH = -1
	steps := int(math.Ceil(durH / dt))
	for i := 0; i < steps; i++ {
		if short := b.step(&s, dt, useGPerH, cover, eatGPerH, 1); short > 0 && runsOutH < 0 {
			runsOutH = float64(i) * dt
		}
	}
	return runsOutH, s
}

func round1(x float64) float64 { return math.Round(x*10) / 10 }
