package server

import (
	"context"
	"encoding/json"
	"net/http"
	"time"
)

// healthz reports whether the database answers: 200 when it does, 503 when
// it does not. Anyone (a load balancer) learns only "ok" or "unavailable";
// signed-in staff also see the connection pool's figures, which tell an
// outsider how busy the practice is.
func (s *Server) healthz(w http.ResponseWriter, r *http.Request) {
	ctx, cancel := context.WithTimeout(r.Context(), 2*time.Second)
	defer cancel()
	body := map[string]any{"status": "ok"}
	status := http.StatusOK
	err := s.Store.Ping(ctx)
	if err != nil {
		s.Log.Warn("healthz: database unreachable", "err", err)
		status = http.StatusServiceUnavailable
		body["status"] = "unavailable"
	}
	if CurrentUser(r) != nil {
		body["database"] = "ok"
		if err != nil {
			body["database"] = "unreachable"
		}
		st := s.Store.Pool.Stat()
		body["connections"] = map[string]int32{"total": st.TotalConns(), "idle": st.IdleConns(), "in_use": st.AcquiredConns(), "max": st.MaxConns()}
	}
	w.Header().Set("Content-Type", "application/json")
	w.Header().Set("Cache-Control", "no-store")
	w.WriteHeader(status)
	_ = json.NewEncoder(w).Encode(body)
}
