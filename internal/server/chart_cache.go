package server

import (
	"crypto/sha256"
	"encoding/binary"
	"hash"
	"io"
	"math"
	"time"

	"larder/internal/mass"

	lru "github.com/hashicorp/golang-lru/v2"

	"larder/internal/chart"
)

// Drawing a chart costs several milliseconds of CPU (gonum/plot), the
// largest part of a client or plan page's time, yet a chart changes only
// when what it is drawn from does. The chart functions are pure, so drawn
// charts are kept by a hash of their whole input: a new or edited
// measurement or plan figure gives a new key, never a stale picture.

// chartCacheSize bounds the kept charts (an SVG is a few tens of KB).
const chartCacheSize = 128

type chartCache = lru.Cache[[sha256.Size]byte, []byte]

func newChartCache() *chartCache {
	c, err := lru.New[[sha256.Size]byte, []byte](chartCacheSize)
	if err != nil {
		panic(err) // only for a size below 1
	}
	return c
}

// chartKey hashes what a chart is drawn from; kind keeps the kinds of
// chart apart.
type chartKey struct{ h hash.Hash }

func newChartKey(kind string) chartKey {
	k := chartKey{sha256.New()}
	k.str(kind)
	return k
}

func (k chartKey) num(v float64) {
	var buf [8]byte
	binary.LittleEndian.PutUint64(buf[:], math.Float64bits(v))
	k.h.Write(buf[:])
}

func (k chartKey) str(v string) {
	k.num(float64(len(v))) // length first, so "ab"+"c" and "a"+"bc" differ
	io.WriteString(k.h, v)
}

// at hashes an instant with its zone, since the charts label clock times.
func (k chartKey) at(t time.Time) {
	k.num(float64(t.UnixNano()))
	k.str(t.Location().String())
}

// drawn returns the chart kept under key, or draws, keeps and returns it.
// The bytes are shared: do not change them.
func (s *Server) drawn(k chartKey, draw func() ([]byte, error)) ([]byte, error) {
	var key [sha256.Size]byte
	k.h.Sum(key[:0])
	if svg, ok := s.charts.Get(key); ok {
		return svg, nil
	}
	svg, err := draw()
	if err != nil {
		return nil, err
	}
	s.charts.Add(key, svg)
	return svg, nil
}

// bodyMassSVG draws the trend of pts, or returns the same drawing made
// before from equal points.
func (s *Server) bodyMassSVG(pts []chart.MassPoint, u mass.Unit) ([]byte, error) {
	k := newChartKey("body-mass-" + string(u))
	for _, p := range pts {
		k.num(float64(p.On.UnixNano()))
		k.num(p.Kg)
	}
	return s.drawn(k, func() ([]byte, error) { return chart.BodyMassTrend(pts, u) })
}

// gPerKgSVG draws the plan's daily g/kg bars (a pure function of days).
func (s *Server) gPerKgSVG(days []chart.DayTarget) ([]byte, error) {
	k := newChartKey("g-per-kg")
	for _, d := range days {
		k.str(d.Label)
		k.num(d.GPerKg)
		k.num(d.BandMin)
		k.num(d.BandMax)
		if d.Overridden {
			k.num(1)
		} else {
			k.num(0)
		}
	}
	return s.drawn(k, func() ([]byte, error) { return chart.GramsPerKgByDay(days) })
}

// glycogenSVG draws a glycogen curve (a pure function of its points, start
// line and label).
func (s *Server) glycogenSVG(pts []chart.GlycogenPoint, start time.Time, label string) ([]byte, error) {
	k := newChartKey("glycogen")
	k.at(start)
	k.str(label)
	for _, p := range pts {
		k.at(p.At)
		k.num(p.MuscleG)
		k.num(p.LiverG)
	}
	return s.drawn(k, func() ([]byte, error) { return chart.GlycogenCurve(pts, start, label) })
}
