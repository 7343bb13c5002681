package server

import (
	"sync"
	"time"
)

// zones keeps time zones by name once loaded. time.LoadLocation reads and
// parses the zone's tzdata file on every call, which the profile of the
// athlete's phone page put at a sixth of its processor time; a plan's zone
// is looked up on every view. Only zones that loaded are kept, so the map
// holds at most the IANA names (a few hundred) that plans actually use. A
// tzdata update on the machine applies from the next restart.
var zones sync.Map // string → *time.Location

// zoneByName is time.LoadLocation, from zones when it has the name.
func zoneByName(name string) (*time.Location, error) {
	if loc, ok := zones.Load(name); ok {
		return loc.(*time.Location), nil
	}
	loc, err := time.LoadLocation(name)
	if err != nil {
		return nil, err
	}
	zones.Store(name, loc)
	return loc, nil
}
