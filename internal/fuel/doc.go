// Package fuel owns Larder's computation: it turns one Request (athlete,
// event, training log, overrides) into a Plan of day-by-day carbohydrate
// targets, feeds, race and repletion figures, a glycogen curve and the
// Findings that check every figure against published guidelines. It is
// pure Go: no I/O, no database, no HTTP. A plan is a professional's tool,
// not medical advice; every Plan carries the Caution text.
//
// What each part models:
//
//   - guidelines.go: Guidelines, the one table of every value the engine
//     uses, each with its source spelled as REFERENCES.md cites it; choices
//     of this engine that no reference fixes say "model assumption".
//   - validate.go: strict JSON decoding (unknown fields rejected) and
//     validation — validator/v10 tags for single fields, hand checks for
//     rules across fields — into a ValidationError that names each field at
//     fault in plain words.
//   - body.go: fat-free mass (measured body fat, else Boer 1984), skeletal
//     muscle by sex (Janssen 2000), the working muscle by modality (legs
//     per Rapoport 2010; a larger share of all muscle for swimming, rowing,
//     skiing, triathlon); Weir, Frayn and Atwater; the carbohydrate share of
//     energy by %VO2max (the shape given by Romijn 1993); event energy
//     (running ≈ 1 kcal/kg/km, cycling from mean power at 24% efficiency,
//     otherwise VO2max × intensity via Weir, or METs).
//   - targets.go: a day's training load in effective minutes (duration ×
//     intensity factor), its band (light 3–5, moderate 5–7, high 6–10,
//     very high 8–12 g/kg/day), the target on one monotone line through the
//     load kept inside the band; protein 1.6 g/kg; fat not below 20% of
//     energy, filling an energy target of 45 kcal/kg FFM plus exercise when
//     fat-free mass is known, and carbohydrate raised inside the band when
//     fat at 35% still leaves energy availability under 45; default eating
//     times (the eating occasions count every feed of the day, protocol
//     feeds included); whole-gram splitting that adds up exactly.
//   - The pipeline: compute.go (Compute, setup of body and event figures),
//     schedule.go (a day's feeds and ordinary meals placed around its
//     sessions), overrides.go (the dietitian's feed overrides), one file
//     per plan kind (loading.go, race.go, repletion.go, week.go, the last
//     also holding the training-load day), simulate.go (the simulation runs
//     a plan needs: start state, exercise and intake lists, the run to the
//     start line and the stores' running out). The four kinds: loading: the taper (default 7 days) on
//     training-load targets, the protocol's load days (two-day 10.5, one-day
//     and three-day 10 g/kg, low-fibre advice), the event day with the
//     pre-event meal (1 g/kg per hour before, 1–4 h, 3 h unless that is
//     in the night hours before 05:00) and in-event fuelling, and the day
//     after on recovery targets. race: the event day, with the day before
//     or after when a pre-event meal or recovery feed falls on it; every
//     feed is listed on the day it falls on. repletion: under 8 h between
//     sessions, 1.1 g/kg/h for the first 4 h (or until the next start) in
//     feeds every 30 min with 0.3 g/kg protein first, then daily needs;
//     8 h or more, daily targets. week: N days of training-load targets.
//     The in-event g/h is the least multiple of 5 g/h (during.rate-step)
//     that keeps the stores from running out, held inside the band for
//     the duration (none to
//     45 min, small amounts to 75 min, 30–60 g/h to 2.5 h, 60–90 g/h
//     beyond) and never above 90 g/h unless the dietitian overrides it.
//     Day and feed overrides are kept, marked, and checked like any value;
//     the other feeds share the rest of the day so feeds always add up.
//   - sim.go: the glycogen model — working muscle, other muscle and liver
//     in 5-minute steps over the plan (in 1-minute steps through the race):
//     first-order gut delivery (1.5 h, at most 105 g/h), a first-pass
//     liver share, resting and daily-living carbohydrate use that scales
//     with the stores (met by what is absorbed, else by liver, muscle and
//     fat, so the intake sets where stores settle; the fasting liver loses
//     a third to a half overnight and slows near a floor, gluconeogenesis
//     sparing it in exercise), muscle synthesis in the working muscle's
//     post-exercise window (emptiness, a rapid phase of hours and a slow
//     one of a day or two, larger after a near-maximal bout that recruits
//     every fibre type, and the glucose supply, slowing towards 220
//     mmol/kg) handing over to resting synthesis in all muscle alike
//     (driven by the supply, slowing to nothing at the level recent intake
//     over resting use sets), calibrated against published refuelling,
//     loading and steady-diet figures (calibration_test.go), a depleted floor of 25 mmol/kg, exercise use from energy × carbohydrate share with intake
//     covering at most about 35% at hard efforts; the stores run out when
//     working muscle and liver are both (nearly) empty. A simulation starts
//     at midnight from typical muscle glycogen and the fed liver a usual
//     day of meals leaves. It gives the state at the
//     start line, the distance and time at which the stores would run out
//     with and without the in-event intake, the comparison with the usual
//     intake, and the body-mass gain (glycogen + 3 g water per g).
//   - findings.go: the checks. Each Finding has a stable code, a level
//     (ok, note, caution, outside), a plain sentence naming the value and
//     the band, the source, and the subject it concerns (a day, a feed,
//     the pre-event meal, the in-event plan, repletion, glycogen, the
//     plan). Recorded client cautions each yield a caution finding.
//   - Events as they are raced: segments.go (multi-sport legs, each with its
//     own energy model — swimming by Kimber 2002's oxygen-uptake equation —,
//     fed only on the bike and the run, the swim drawing on the arms and
//     trunk), stages.go (a stage race as one plan and one simulation; pace
//     to %VO2max when VO2max is known), ultra.go (events over 24 h: blocks
//     of hours through the night, no ordinary meal inside the race),
//     sessions_long.go (sessions of 90 min or more in week and loading
//     plans, and the train-low mark), findings_events.go (caffeine per the
//     IOC 2018 statement and Pedersen 2008, diabetes cautions that never
//     compute insulin, the pre-event meal's protein, the fitness finding).
//
// Limits: the glycogen model is a teaching-grade model calibrated to
// published measurements (calibration_test.go: refuelling rates, 24 h
// restoration, the 2-hour-delay effect, the marathon wall), not a
// validated physiological simulator; one-day loading after a supramaximal
// bout (Fairchild 2002) reaches only about half the measured gain. Energy availability is (intake −
// exercise) / FFM and is honestly negative on days whose exercise
// outweighs the intake.
package fuel
