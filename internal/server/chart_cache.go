package server

import (
	"crypto/sha256"
	"encoding/binary"
	"math"

	lru "github.com/hashicorp/golang-lru/v2"

	"larder/internal/chart"
)

// Drawing a body-mass trend costs several milliseconds of CPU (gonum/plot),
// the largest part of a client page's time, yet it changes only when the
// measurements do. chart.BodyMassTrend is a pure function of its points, so
// drawn charts are kept by a hash of the points: a new or edited
// measurement gives a new key, never a stale picture.

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

// bodyMassSVG draws the trend of pts, or returns the same drawing made
// before from equal points. The bytes are shared: do not change them.
func (s *Server) bodyMassSVG(pts []chart.MassPoint) ([]byte, error) {
	h := sha256.New()
	var buf [16]byte
	for _, p := range pts {
		binary.LittleEndian.PutUint64(buf[:8], uint64(p.On.UnixNano()))
		binary.LittleEndian.PutUint64(buf[8:], math.Float64bits(p.Kg))
		h.Write(buf[:])
	}
	var key [sha256.Size]byte
	h.Sum(key[:0])
	if svg, ok := s.charts.Get(key); ok {
		return svg, nil
	}
	svg, err := chart.BodyMassTrend(pts)
	if err != nil {
		return nil, err
	}
	s.charts.Add(key, svg)
	return svg, nil
}
