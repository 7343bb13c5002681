package web

import (
	"sync"
	"time"
)

// zones keeps time zones by name once loaded: time.LoadLocation reads and
// parses the zone's tzdata file on every call, and the staff pages format
// every event's start in its zone (a tenth of the client page's processor
// time in its profile). Only zones that loaded are kept, so the map holds
// at most the IANA names (a few hundred) that events and plans use. A
// tzdata update on the machine applies from the next restart.
var zones sync.Map // string → *time.Location

// zone is time.LoadLocation, from zones when it has the name, and UTC for
// a name that does not load (the pages name the zone beside the time, so a
// stored name the machine does not know still shows what was recorded).
func zone(name string) *time.Location {
	if loc, ok := zones.Load(name); ok {
		return loc.(*time.Location)
	}
	loc, err := time.LoadLocation(name)
	if err != nil {
		return time.UTC
	}
	zones.Store(name, loc)
	return loc
}
