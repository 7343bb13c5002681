// Package chart draws Larder's server-side charts as SVG with gonum/plot: the
// body-mass trend of a client, a plan's g/kg by day against the guideline band,
// and the expected glycogen curve to the start line. It draws what it is given
// and computes nothing of physiology; the same input gives the same bytes.
package chart

import (
	"bytes"
	"errors"
	"fmt"
	"image/color"
	"math"
	"time"

	"larder/internal/mass"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgsvg"
)

// Colours of our own; levels and overrides are also told by marker shape and
// legend words, never by colour alone.
var (
	ink      = color.RGBA{0x22, 0x2b, 0x33, 0xff}
	series1  = color.RGBA{0x1f, 0x5f, 0x8b, 0xff}  // deep blue
	series2  = color.RGBA{0xb8, 0x6b, 0x12, 0xff}  // amber brown
	bandFill = color.NRGBA{0x5f, 0xa8, 0x72, 0x70} // translucent green
	overFill = color.RGBA{0xa3, 0x3b, 0x2a, 0xff}  // brick red
	startRed = color.RGBA{0x8a, 0x1c, 0x1c, 0xff}
)

// ErrNoData is returned when there is nothing to draw.
var ErrNoData = errors.New("chart: no data to draw")

// Size of every chart, in points; the page scales the SVG to its width.
const (
	width  = 16 * vg.Centimeter
	height = 7 * vg.Centimeter
)

// MassPoint is one body-mass measurement.
type MassPoint struct {
	On time.Time
	Kg float64
}

// BodyMassTrend draws body mass over time in unit u (the points are in kg).
func BodyMassTrend(points []MassPoint, u mass.Unit) ([]byte, error) {
	if len(points) == 0 {
		return nil, ErrNoData
	}
	loc := points[0].On.Location()
	p := newPlot("Body mass", "date", string(u))
	p.X.Tick.Marker = dateTicks(loc, "2 Jan")
	xys := make(plotter.XYs, len(points))
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, m := range points {
		if !finite(m.Kg) {
			return nil, fmt.Errorf("chart: body mass %d is not a number", i)
		}
		y := mass.FromKg(m.Kg, u)
		xys[i] = plotter.XY{X: float64(m.On.Unix()), Y: y}
		lo, hi = math.Min(lo, y), math.Max(hi, y)
	}
	line, pts, err := plotter.NewLinePoints(xys)
	if err != nil {
		return nil, err
	}
	line.Color = series1
	line.Width = vg.Points(1.5)
	pts.Color = series1
	pts.Shape = draw.CircleGlyph{}
	p.Add(line, pts)
	p.Legend.Add("body mass ("+string(u)+")", line, pts)
	// A little room around the data so a flat trend is not drawn as noise.
	p.Y.Min, p.Y.Max = math.Floor(lo-1), math.Ceil(hi+1+0.25*(hi-lo))
	if len(points) == 1 {
		t := float64(points[0].On.Unix())
		p.X.Min, p.X.Max = t-86400*3, t+86400*3
	}
	return render(p)
}

// DayTarget is one plan day for the g/kg chart.
type DayTarget struct {
	Label      string  // e.g. "Fri 16"
	GPerKg     float64 // the day's carbohydrate target
	BandMin    float64 // the guideline band of the day, g/kg
	BandMax    float64
	Overridden bool
}

// GramsPerKgByDay draws each day's g/kg target as a bar over its guideline band.
// Overridden days get a different marker and a legend entry.
func GramsPerKgByDay(days []DayTarget) ([]byte, error) {
	if len(days) == 0 {
		return nil, ErrNoData
	}
	p := newPlot("Carbohydrate by day", "", "g/kg body mass")
	labels := make([]string, len(days))
	values := make(plotter.Values, len(days))
	var over plotter.XYs
	top := 0.0
	for i, d := range days {
		if !finite(d.GPerKg) || !finite(d.BandMin) || !finite(d.BandMax) {
			return nil, fmt.Errorf("chart: day %d has a figure that is not a number", i)
		}
		labels[i] = d.Label
		values[i] = d.GPerKg
		top = math.Max(top, math.Max(d.GPerKg, d.BandMax))
		if d.Overridden {
			over = append(over, plotter.XY{X: float64(i), Y: d.GPerKg})
		}
	}
	// The band of each day as a shaded box behind its bar.
	var firstBand *plotter.Polygon
	for i, d := range days {
		if d.BandMax <= 0 {
			continue
		}
		x := float64(i)
		poly, err := plotter.NewPolygon(plotter.XYs{
			{X: x - 0.42, Y: d.BandMin}, {X: x + 0.42, Y: d.BandMin},
			{X: x + 0.42, Y: d.BandMax}, {X: x - 0.42, Y: d.BandMax},
		})
		if err != nil {
			return nil, err
		}
		poly.Color = bandFill
		poly.LineStyle.Width = 0
		p.Add(poly)
		if firstBand == nil {
			firstBand = poly
		}
	}
	bars, err := plotter.NewBarChart(values, width/vg.Length(3*len(days)+2))
	if err != nil {
		return nil, err
	}
	bars.Color = series1
	bars.LineStyle.Width = 0
	p.Add(bars)
	p.NominalX(labels...)
	if firstBand != nil {
		p.Legend.Add("guideline band", firstBand)
	}
	p.Legend.Add("target (g/kg)", bars)
	if len(over) > 0 {
		sc, err := plotter.NewScatter(over)
		if err != nil {
			return nil, err
		}
		sc.Shape = draw.PyramidGlyph{}
		sc.Color = overFill
		sc.Radius = vg.Points(5)
		p.Add(sc)
		p.Legend.Add("override", sc)
	}
	// Headroom above the tallest figure keeps the legend clear of the bars.
	p.Y.Min, p.Y.Max = 0, math.Ceil(top*1.3+1)
	return render(p)
}

// GlycogenPoint is one sample of the simulated stores.
type GlycogenPoint struct {
	At      time.Time
	MuscleG float64
	LiverG  float64
}

// GlycogenCurve draws muscle and liver glycogen over time with a vertical line
// at start (the start line of the event, or the next session); a zero start
// draws no line.
func GlycogenCurve(points []GlycogenPoint, start time.Time, startLabel string) ([]byte, error) {
	if len(points) == 0 {
		return nil, ErrNoData
	}
	loc := points[0].At.Location()
	p := newPlot("Estimated glycogen (model)", "", "g")
	p.X.Tick.Marker = clockTicks{loc: loc}
	muscle := make(plotter.XYs, len(points))
	liver := make(plotter.XYs, len(points))
	top := 0.0
	for i, g := range points {
		if !finite(g.MuscleG) || !finite(g.LiverG) {
			return nil, fmt.Errorf("chart: glycogen point %d is not a number", i)
		}
		x := float64(g.At.Unix())
		muscle[i] = plotter.XY{X: x, Y: g.MuscleG}
		liver[i] = plotter.XY{X: x, Y: g.LiverG}
		top = math.Max(top, math.Max(g.MuscleG, g.LiverG))
	}
	ml, err := plotter.NewLine(muscle)
	if err != nil {
		return nil, err
	}
	ml.Color, ml.Width = series1, vg.Points(1.8)
	ll, err := plotter.NewLine(liver)
	if err != nil {
		return nil, err
	}
	ll.Color, ll.Width = series2, vg.Points(1.8)
	ll.Dashes = []vg.Length{vg.Points(5), vg.Points(3)}
	p.Add(ml, ll)
	p.Legend.Add("muscle glycogen", ml)
	p.Legend.Add("liver glycogen", ll)
	p.Y.Min, p.Y.Max = 0, math.Ceil((top*1.35)/50)*50
	if !start.IsZero() {
		x := float64(start.Unix())
		sl, err := plotter.NewLine(plotter.XYs{{X: x, Y: 0}, {X: x, Y: p.Y.Max}})
		if err != nil {
			return nil, err
		}
		sl.Color, sl.Width = startRed, vg.Points(1.2)
		sl.Dashes = []vg.Length{vg.Points(2), vg.Points(2)}
		p.Add(sl)
		if startLabel == "" {
			startLabel = "start"
		}
		p.Legend.Add(startLabel, sl)
	}
	return render(p)
}

func newPlot(title, x, y string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.Title.TextStyle.Color = ink
	p.X.Label.Text = x
	p.Y.Label.Text = y
	p.Legend.Top = true
	p.Legend.Left = true
	p.Legend.TextStyle.Font.Size = vg.Points(9)
	p.Legend.Padding = vg.Points(2)
	p.Legend.XOffs = vg.Points(8)
	p.Y.Tick.Marker = wholeTicks{}
	p.Add(plotter.NewGrid())
	return p
}

// dateTicks labels a Unix-seconds axis with dates in the data's own zone.
func dateTicks(loc *time.Location, format string) plot.TimeTicks {
	return plot.TimeTicks{
		Format: format,
		Time:   func(t float64) time.Time { return time.Unix(int64(t), 0).In(loc) },
	}
}

// clockTicks labels a Unix-seconds axis at round local times: whole hours
// (every 1, 2, 3, 6 or 12 h) over a day or so, local midnights over longer
// spans. gonum's own time ticks fall at odd minutes (05:56, 19:50), which
// read as figures of the plan when they are not.
type clockTicks struct{ loc *time.Location }

func (c clockTicks) Ticks(min, max float64) []plot.Tick {
	from := time.Unix(int64(math.Floor(min)), 0).In(c.loc)
	to := time.Unix(int64(math.Ceil(max)), 0).In(c.loc)
	span := to.Sub(from)
	if span <= 0 {
		return nil
	}
	var ticks []plot.Tick
	add := func(t time.Time, label string) {
		x := float64(t.Unix())
		if x >= min && x <= max {
			ticks = append(ticks, plot.Tick{Value: x, Label: label})
		}
	}
	if span <= 48*time.Hour {
		step := 12
		for _, h := range []int{1, 2, 3, 6, 12} {
			if span <= time.Duration(h*6)*time.Hour {
				step = h
				break
			}
		}
		// A span past a midnight names the day with the hour, so 06:00 of
		// the second day does not read as the first day's.
		crosses := from.YearDay() != to.YearDay()
		t := time.Date(from.Year(), from.Month(), from.Day(), from.Hour(), 0, 0, 0, c.loc)
		for ; !t.After(to); t = t.Add(time.Hour) {
			if t.Hour()%step != 0 {
				continue
			}
			label := t.Format("15:04")
			if crosses && (t.Hour() == 0 || len(ticks) == 0) {
				label = t.Format("Mon 15:04")
			}
			add(t, label)
		}
		return ticks
	}
	days := int(math.Ceil(span.Hours() / 24 / 6))
	if days < 1 {
		days = 1
	}
	t := time.Date(from.Year(), from.Month(), from.Day(), 0, 0, 0, 0, c.loc)
	for i := 0; !t.After(to); i, t = i+1, t.AddDate(0, 0, 1) {
		if i%days == 0 {
			add(t, t.Format("Mon 2 Jan"))
		}
	}
	return ticks
}

// wholeTicks labels a value axis without needless decimals (500, not 500.00).
type wholeTicks struct{}

func (wholeTicks) Ticks(min, max float64) []plot.Tick {
	ticks := plot.DefaultTicks{}.Ticks(min, max)
	for i := range ticks {
		if ticks[i].Label == "" {
			continue
		}
		v := ticks[i].Value
		if v == math.Trunc(v) {
			ticks[i].Label = fmt.Sprintf("%.0f", v)
		} else {
			ticks[i].Label = fmt.Sprintf("%g", math.Round(v*10)/10)
		}
	}
	return ticks
}

func render(p *plot.Plot) ([]byte, error) {
	c := vgsvg.NewWith(vgsvg.UseWH(width, height), vgsvg.EmbedFonts(false))
	p.Draw(draw.New(c))
	var buf bytes.Buffer
	if _, err := c.WriteTo(&buf); err != nil {
		return nil, err
	}
	return presentationAttrs(buf.Bytes()), nil
}

func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
