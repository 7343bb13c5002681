package server

import (
	"context"
	"encoding/json"
	"net/http"
	"time"
)

// healthz reports whether the database answers: 200 when it does, 503 when
// it does not, with the state as JSON for load balancers and people.
func (s *Server) healthz(w http.ResponseWriter, r *http.Request) {
	ctx, cancel := context.WithTimeout(r.Context(), 2*time.Second)
	defer cancel()
	body := map[string]any{"status": "ok", "database": "ok"}
	status := http.StatusOK
	if err := s.Store.Ping(ctx); err != nil {
		s.Log.Warn("healthz: database unreachable", "err", err)
		status = http.StatusServiceUnavailable
		body = map[string]any{"status": "unavailable", "database": "unreachable"}
	} else {
		st := s.Store.Pool.Stat()
		body["connections"] = map[string]int32{"total": st.TotalConns(), "idle": st.IdleConns(), "in_use": st.AcquiredConns()}
	}
	w.Header().Set("Content-Type", "application/json")
	w.Header().Set("Cache-Control", "no-store")
	w.WriteHeader(status)
	_ = json.NewEncoder(w).Encode(body)
}
