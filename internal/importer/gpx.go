package importer

import (
	"bytes"
	"encoding/xml"
	"math"
	"strconv"
	"strings"
	"time"
)

// GPX 1.1 (topografix.com/GPX/1/1) keeps a track as segments of points,
// each with latitude, longitude and usually a UTC time. Heart rate and power
// are not part of GPX itself; devices write them in extensions (the widely
// used TrackPointExtension has <hr>; power is usually a <power> element).
// encoding/xml matches elements by local name when a tag names no
// namespace, so each vendor's prefix is read alike.
type gpxDoc struct {
	XMLName xml.Name   `xml:"gpx"`
	Tracks  []gpxTrack `xml:"trk"`
}

type gpxTrack struct {
	Name     string       `xml:"name"`
	Type     string       `xml:"type"`
	Segments []gpxSegment `xml:"trkseg"`
}

type gpxSegment struct {
	Points []gpxPoint `xml:"trkpt"`
}

type gpxPoint struct {
	Lat  string `xml:"lat,attr"`
	Lon  string `xml:"lon,attr"`
	Time string `xml:"time"`
	Ext  struct {
		HR     []string `xml:"TrackPointExtension>hr"`
		HRFlat []string `xml:"hr"`
		Power  []string `xml:"power"`
		PowerT []string `xml:"TrackPointExtension>power"`
	} `xml:"extensions"`
}

// earthRadiusKm is the mean Earth radius (IUGG, 6371.0088 km), used by the
// haversine distance between track points.
const earthRadiusKm = 6371.0088

func haversineKm(lat1, lon1, lat2, lon2 float64) float64 {
	rad := math.Pi / 180
	dLat := (lat2 - lat1) * rad
	dLon := (lon2 - lon1) * rad
	a := math.Sin(dLat/2)*math.Sin(dLat/2) + math.Cos(lat1*rad)*math.Cos(lat2*rad)*math.Sin(dLon/2)*math.Sin(dLon/2)
	return 2 * earthRadiusKm * math.Asin(math.Min(1, math.Sqrt(a)))
}

func readGPX(name string, data []byte, opt ActivityOptions) ([]SessionRow, error) {
	var doc gpxDoc
	dec := xml.NewDecoder(bytes.NewReader(data))
	if err := dec.Decode(&doc); err != nil {
		if strings.Contains(err.Error(), "expected element type <gpx>") {
			return nil, refuse(name + " is XML but not GPX (its first element is not <gpx>).")
		}
		return nil, refuse(name + " is not well-formed GPX: " + err.Error() + ".")
	}
	if len(doc.Tracks) == 0 {
		return nil, refuse(name + " holds no track: a GPX route or waypoint list is not a recorded session.")
	}
	// All tracks of a file are one session (some devices split a paused
	// recording into tracks); the first track's type names the sport.
	var first, last time.Time
	var meters float64
	var hrSum, hrN, pSum, pN float64
	sport := ""
	points := 0
	for _, trk := range doc.Tracks {
		if sport == "" {
			sport = strings.TrimSpace(trk.Type)
		}
		for _, seg := range trk.Segments {
			havePrev := false
			var pLat, pLon float64
			for _, pt := range seg.Points {
				lat, err1 := strconv.ParseFloat(strings.TrimSpace(pt.Lat), 64)
				lon, err2 := strconv.ParseFloat(strings.TrimSpace(pt.Lon), 64)
				if err1 != nil || err2 != nil || math.Abs(lat) > 90 || math.Abs(lon) > 180 {
					return nil, refuse(name + " has a track point without a valid latitude and longitude.")
				}
				points++
				if havePrev {
					meters += 1000 * haversineKm(pLat, pLon, lat, lon)
				}
				pLat, pLon, havePrev = lat, lon, true
				if ts := strings.TrimSpace(pt.Time); ts != "" {
					at, err := time.Parse(time.RFC3339, ts)
					if err != nil {
						return nil, refuse(name + " has a track point time that is not ISO 8601: " + strconv.Quote(ts) + ".")
					}
					if first.IsZero() || at.Before(first) {
						first = at
					}
					if at.After(last) {
						last = at
					}
				}
				for _, v := range append(pt.Ext.HR, pt.Ext.HRFlat...) {
					if x, err := strconv.ParseFloat(strings.TrimSpace(v), 64); err == nil && x > 0 && x < 300 {
						hrSum, hrN = hrSum+x, hrN+1
					}
				}
				for _, v := range append(pt.Ext.Power, pt.Ext.PowerT...) {
					if x, err := strconv.ParseFloat(strings.TrimSpace(v), 64); err == nil && x >= 0 && x < 3000 {
						pSum, pN = pSum+x, pN+1
					}
				}
			}
		}
	}
	if points < 2 || first.IsZero() || !last.After(first) {
		return nil, refuse(name + " has too few timed track points to give a session's start and duration.")
	}
	hr, power := roundedMean(hrSum, hrN), roundedMean(pSum, pN)
	row, err := finish(name, first, last.Sub(first).Seconds(), meters, sport, hr, power, opt)
	if err != nil {
		return nil, err
	}
	return []SessionRow{row}, nil
}
