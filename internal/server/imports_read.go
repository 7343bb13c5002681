package server

import (
	"context"
	"fmt"
	"net/url"
	"slices"
	"strconv"
	"strings"
	"time"

	"larder/internal/importer"
	"larder/internal/mass"
	"larder/internal/store"
	"larder/web"
)

// readUpload is an upload read with the person's answers: the view of the
// preview, and the rows the store would import.
type readUpload struct {
	view     web.ImportPreviewData
	mass     []store.ImportMass
	sessions []store.ImportSession
	labels   map[int]string // line → what the preview shows for it (activity files: the file name)
	clients  map[int64]string
	texts    map[int]string
	clientOf map[int]string
	unitOf   map[int]mass.Unit // line → the unit its client is weighed in
}

func (s *Server) readUpload(ctx context.Context, up store.Upload, c *store.Client, in url.Values) (*readUpload, error) {
	answers := url.Values{}
	for _, k := range answerKeys {
		if v := strings.TrimSpace(in.Get(k)); v != "" {
			answers.Set(k, v)
		}
	}
	for k, v := range in {
		if strings.HasPrefix(k, "map_") && len(v) > 0 && v[0] != "" {
			answers.Set(k, v[0])
		}
	}
	if answers.Get("mass_unit") == "" {
		// Bare numbers are first read in the unit the client is weighed in,
		// or for a practice's file in the practice's unit.
		if c != nil {
			answers.Set("mass_unit", string(c.Unit))
		} else {
			u, err := s.Store.Setting(ctx, store.SettingMassUnit, string(mass.Default))
			if err != nil {
				return nil, err
			}
			answers.Set("mass_unit", string(mass.Or(mass.Unit(u), mass.Default)))
		}
	}
	if answers.Get("default_zone") == "" || !slices.Contains(store.Zones, answers.Get("default_zone")) {
		answers.Set("default_zone", "endurance")
	}
	p := &readUpload{labels: map[int]string{}, texts: map[int]string{}, clientOf: map[int]string{}, unitOf: map[int]mass.Unit{}}
	names := make([]string, len(up.Files))
	for i, f := range up.Files {
		names[i] = f.Name
	}
	p.view = web.ImportPreviewData{
		Client: c, Action: web.Path("imports", up.ID), Kind: up.Kind, Files: strings.Join(names, ", "), Answers: answers,
		Zones: zoneOptions(),
	}
	switch up.Kind {
	case "activity":
		p.view.KindLabel = "training sessions"
		p.readActivities(up, c, answers)
		return p, nil
	case string(importer.KindBodyMass):
		p.view.KindLabel = "body-mass measurements"
	default:
		p.view.KindLabel = "training sessions"
	}
	opt := importer.Options{Kind: importer.Kind(up.Kind), Practice: c == nil, DateOrder: answers.Get("date_order"),
		MassUnit: answers.Get("mass_unit"), DefaultZone: answers.Get("default_zone"), Mapping: map[string]string{}}
	for k, v := range answers {
		if h, ok := strings.CutPrefix(k, "map_"); ok {
			opt.Mapping[h] = v[0]
		}
	}
	sh, err := importer.ReadCSV(up.Files[0].Content, opt)
	if err != nil {
		p.view.Refused = []string{err.Error()}
		p.view.Questions = true
		return p, nil
	}
	if !sh.Ready() {
		p.view.Questions = true
		choices := []web.Option{{Value: "", Label: "(choose)"}, {Value: importer.Ignore, Label: "Leave this column out"}}
		for _, f := range importer.Fields(opt.Kind, opt.Practice) {
			choices = append(choices, web.Option{Value: f.Key, Label: f.Label})
		}
		for _, col := range sh.Unknown {
			p.view.Unknown = append(p.view.Unknown, web.ImportColumnQuestion{Param: "map_" + importer.NormHeader(col.Header), Header: col.Header, Choices: choices})
		}
		for _, f := range sh.Missing {
			p.view.Missing = append(p.view.Missing, f.Label)
		}
		if sh.DateOrderNeeded {
			p.view.AskDate = sh.AmbiguousExample
			if p.view.AskDate == "" {
				p.view.AskDate = "03/04/2026"
			}
		}
		return p, nil
	}
	for _, pr := range sh.Problems {
		p.view.Problems = append(p.view.Problems, web.PreviewProblem{Line: strconv.Itoa(pr.Line), Column: pr.Column, Reason: pr.Reason})
	}
	ids, err := s.clientIDs(ctx, p, c, sh)
	if err != nil {
		return nil, err
	}
	for _, m := range sh.Mass {
		id, ok := ids[m.Line]
		if !ok {
			continue
		}
		p.mass = append(p.mass, m.ForStore(id))
		p.texts[m.Line] = massText(m, p.unitOf[m.Line])
	}
	for _, t := range sh.Sessions {
		id, ok := ids[t.Line]
		if !ok {
			continue
		}
		p.sessions = append(p.sessions, t.ForStore(id))
		p.texts[t.Line] = importSessionText(t)
		if t.IntensityAssumed {
			p.view.Assumed++
		}
	}
	return p, nil
}

// clientIDs gives each good line its client: the page's client, or for a
// practice-wide file the one client of the row's name and date of birth
// (a row naming none, or two, is a problem).
func (s *Server) clientIDs(ctx context.Context, p *readUpload, c *store.Client, sh *importer.Sheet) (map[int]int64, error) {
	type ref struct {
		line int
		key  store.ClientKey
	}
	var refs []ref
	for _, m := range sh.Mass {
		refs = append(refs, ref{m.Line, store.ClientKey{Name: m.Client.Name, DOB: m.Client.DOB}})
	}
	for _, t := range sh.Sessions {
		refs = append(refs, ref{t.Line, store.ClientKey{Name: t.Client.Name, DOB: t.Client.DOB}})
	}
	ids := map[int]int64{}
	if c != nil {
		for _, r := range refs {
			ids[r.line] = c.ID
			p.unitOf[r.line] = c.Unit
		}
		return ids, nil
	}
	seen := map[store.ClientKey]bool{}
	var keys []store.ClientKey
	for _, r := range refs {
		if !seen[r.key] {
			seen[r.key] = true
			keys = append(keys, r.key)
		}
	}
	matches, err := s.Store.MatchClients(ctx, keys)
	if err != nil {
		return nil, err
	}
	col := "client"
	for _, cl := range sh.Columns {
		if cl.Field == importer.FieldClient {
			col = cl.Header
		}
	}
	for _, r := range refs {
		m := matches[r.key]
		who := r.key.Name + " (born " + r.key.DOB.Format(time.DateOnly) + ")"
		switch {
		case m.ID != 0:
			ids[r.line] = m.ID
			p.clientOf[r.line] = r.key.Name
			p.unitOf[r.line] = m.Unit
		case m.Count > 1:
			p.view.Problems = append(p.view.Problems, web.PreviewProblem{Line: strconv.Itoa(r.line), Column: col,
				Reason: fmt.Sprintf("%d clients are %s; import this row from the right client's page.", m.Count, who)})
		default:
			p.view.Problems = append(p.view.Problems, web.PreviewProblem{Line: strconv.Itoa(r.line), Column: col,
				Reason: "No client is " + who + ". Add the client first, or check the spelling and date of birth."})
		}
	}
	slices.SortStableFunc(p.view.Problems, func(a, b web.PreviewProblem) int {
		x, _ := strconv.Atoi(a.Line)
		y, _ := strconv.Atoi(b.Line)
		return x - y
	})
	return ids, nil
}

func (p *readUpload) readActivities(up store.Upload, c *store.Client, answers url.Values) {
	if answers.Get("time_zone") == "" {
		answers.Set("time_zone", "UTC")
	}
	loc, err := time.LoadLocation(answers.Get("time_zone"))
	if err != nil {
		loc = time.UTC
		answers.Set("time_zone", "UTC")
	}
	mod := answers.Get("default_modality")
	if mod != "" && !slices.Contains(store.Modalities, mod) {
		mod = ""
		answers.Del("default_modality")
	}
	p.view.AskZone = true
	for _, z := range importTimeZones {
		p.view.ZoneNames = append(p.view.ZoneNames, web.Option{Value: z, Label: z})
	}
	if tz := answers.Get("time_zone"); !slices.Contains(importTimeZones, tz) {
		p.view.ZoneNames = append(p.view.ZoneNames, web.Option{Value: tz, Label: tz})
	}
	p.view.Modalities = []web.Option{{Value: "", Label: "None: refuse such files"}}
	for _, m := range store.Modalities {
		p.view.Modalities = append(p.view.Modalities, web.Option{Value: m, Label: store.ModalityLabel(m)})
	}
	line := 0
	for _, f := range up.Files {
		rows, err := importer.ReadActivity(f.Name, f.Content, importer.ActivityOptions{Location: loc, DefaultZone: answers.Get("default_zone"), DefaultModality: mod})
		if err != nil {
			p.view.Problems = append(p.view.Problems, web.PreviewProblem{Line: f.Name, Reason: err.Error()})
			continue
		}
		for i := range rows {
			line++
			rows[i].Line = line
			p.labels[line] = f.Name
			p.sessions = append(p.sessions, rows[i].ForStore(c.ID))
			p.texts[line] = importSessionText(rows[i])
			p.view.Assumed++
		}
	}
}

// previewShown bounds the rows listed on the preview; the counts cover all.
const previewShown = 200

// previewRows asks the store which rows are duplicates and fills the lists.
func (s *Server) previewRows(ctx context.Context, p *readUpload) error {
	var res store.ImportResult
	var err error
	var lines []int
	if p.view.Kind == string(importer.KindBodyMass) {
		if len(p.mass) > 0 {
			res, err = s.Store.PreviewBodyMass(ctx, p.mass)
		}
		for _, m := range p.mass {
			lines = append(lines, m.Line)
		}
	} else {
		if len(p.sessions) > 0 {
			res, err = s.Store.PreviewTraining(ctx, p.sessions)
		}
		for _, t := range p.sessions {
			lines = append(lines, t.Line)
		}
	}
	if err != nil {
		return err
	}
	dup := map[int]bool{}
	for _, l := range res.Duplicates {
		dup[l] = true
	}
	p.view.AddCount, p.view.DupCount = res.Added, len(res.Duplicates)
	for _, l := range lines {
		row := web.PreviewLine{Line: p.label(l), Client: p.clientOf[l], Text: p.texts[l]}
		switch {
		case dup[l]:
			if len(p.view.Duplicates) < previewShown {
				p.view.Duplicates = append(p.view.Duplicates, row)
			}
		case len(p.view.ToAdd) < previewShown:
			p.view.ToAdd = append(p.view.ToAdd, row)
		}
	}
	p.view.MoreToAdd = p.view.AddCount - len(p.view.ToAdd)
	return nil
}

func (p *readUpload) label(line int) string {
	if l, ok := p.labels[line]; ok {
		return l
	}
	return strconv.Itoa(line)
}

func zoneOptions() []web.Option {
	var out []web.Option
	for _, z := range store.Zones {
		out = append(out, web.Option{Value: z, Label: strings.ToUpper(z[:1]) + z[1:] + " zone"})
	}
	return out
}

// massText is a body-mass row as the preview lists it: the mass in the unit
// its client is weighed in, as finely as a form shows it (0.01 kg, 0.1 lb),
// and what the file wrote when that was the other unit.
func massText(m importer.MassRow, u mass.Unit) string {
	u = mass.Or(u, mass.Default)
	s := m.On.Format(time.DateOnly) + " · " + mass.Precise(m.MassKg, u)
	if written := mass.Unit(m.Unit); written != u {
		s += " (written as " + mass.Precise(m.MassKg, mass.Or(written, mass.Default)) + ")"
	}
	if m.BodyFatPct != nil {
		s += " · body fat " + strconv.FormatFloat(*m.BodyFatPct, 'f', -1, 64) + " %"
	}
	if m.Method != "" {
		s += " · " + m.Method
	}
	return s
}

func importSessionText(t importer.SessionRow) string {
	parts := []string{strings.TrimSpace(t.On.Format(time.DateOnly) + " " + t.Start), store.ModalityLabel(t.Modality), strconv.Itoa(t.DurationMin) + " min"}
	if t.DistanceKm != nil {
		parts = append(parts, strconv.FormatFloat(*t.DistanceKm, 'f', -1, 64)+" km")
	}
	switch t.IntensityKind {
	case store.IntensityRPE:
		parts = append(parts, "RPE "+strconv.FormatFloat(*t.IntensityValue, 'f', -1, 64))
	case store.IntensityPctVO2max:
		parts = append(parts, strconv.FormatFloat(*t.IntensityValue, 'f', -1, 64)+"% VO2max")
	case store.IntensityZone:
		z := t.IntensityZone + " zone"
		if t.IntensityAssumed {
			z += " (chosen above)"
		}
		parts = append(parts, z)
	}
	if t.AvgHeartRate != nil {
		parts = append(parts, "average heart rate "+strconv.Itoa(*t.AvgHeartRate)+" bpm")
	}
	if t.AvgPowerW != nil {
		parts = append(parts, "average power "+strconv.Itoa(*t.AvgPowerW)+" W")
	}
	if t.Status == store.StatusPlanned {
		parts = append(parts, "planned")
	}
	return strings.Join(parts, " · ")
}
