package importer

import "larder/internal/store"

// ForStore gives the row as the store imports it, for the given client.
func (m MassRow) ForStore(clientID int64) store.ImportMass {
	return store.ImportMass{Line: m.Line, ClientID: clientID, On: m.On, MassKg: m.MassKg, BodyFatPct: m.BodyFatPct, Method: m.Method, Unit: m.Unit}
}

// ForStore gives the session as the store imports it, for the given client.
func (t SessionRow) ForStore(clientID int64) store.ImportSession {
	return store.ImportSession{Line: t.Line, ClientID: clientID, On: t.On, Start: t.Start, Modality: t.Modality, DurationMin: t.DurationMin,
		IntensityKind: t.IntensityKind, IntensityValue: t.IntensityValue, IntensityZone: t.IntensityZone, DistanceKm: t.DistanceKm,
		AvgHeartRate: t.AvgHeartRate, AvgPowerW: t.AvgPowerW, Status: t.Status, Notes: t.Notes, Source: t.Source}
}
