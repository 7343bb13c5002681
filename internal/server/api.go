package server

import (
	"encoding/json"
	"errors"
	"net/http"

	"github.com/go-chi/chi/v5"

	"larder/internal/fuel"
)

// mountAPI adds the JSON API for signed-in staff: POST /api/v1/compute takes
// the engine's request and answers with its plan, as `larder compute` does.
func (s *Server) mountAPI(r chi.Router) {
	r.Post("/api/v1/compute", s.apiCompute)
}

type apiErrors struct {
	Errors fuel.ValidationError `json:"errors"`
}

func (s *Server) apiCompute(w http.ResponseWriter, r *http.Request) {
	r.Body = http.MaxBytesReader(w, r.Body, fuel.MaxRequestBytes+1)
	req, err := fuel.DecodeRequest(r.Body)
	if err == nil {
		var plan fuel.Plan
		if plan, err = fuel.Compute(req); err == nil {
			writeJSON(w, http.StatusOK, plan)
			return
		}
	}
	var ve fuel.ValidationError
	if errors.As(err, &ve) {
		writeJSON(w, http.StatusUnprocessableEntity, apiErrors{Errors: ve})
		return
	}
	s.Log.Error("api compute", "err", err)
	writeJSON(w, http.StatusInternalServerError, apiErrors{Errors: fuel.ValidationError{{Field: "request", Message: "could not be computed because of a problem on the server"}}})
}

func writeJSON(w http.ResponseWriter, status int, v any) {
	w.Header().Set("Content-Type", "application/json; charset=utf-8")
	w.Header().Set("Cache-Control", "no-store")
	w.WriteHeader(status)
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	_ = enc.Encode(v)
}
