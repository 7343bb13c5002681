package server

import (
	"bytes"
	"encoding/json"
	"errors"
	"io"
	"net/http"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"

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
	body, err := io.ReadAll(http.MaxBytesReader(w, r.Body, fuel.MaxRequestBytes+1))
	if err == nil {
		if field := untextField(body); field != "" {
			writeJSON(w, http.StatusUnprocessableEntity, apiErrors{Errors: fuel.ValidationError{{Field: field, Message: "holds characters that cannot be saved (a NUL character or text that is not UTF-8)"}}})
			return
		}
	}
	req, err := fuel.DecodeRequest(io.MultiReader(bytes.NewReader(body), errReader{err}))
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

// errReader hands on a read error (a body over the size limit) to the
// decoder after the bytes that were read.
type errReader struct{ err error }

func (e errReader) Read([]byte) (int, error) {
	if e.err == nil {
		return 0, io.EOF
	}
	return 0, e.err
}

// untextField names the first place in a JSON body holding text no database
// column can hold: the whole "request" when the body is not UTF-8 (the JSON
// decoder would quietly replace the bytes), else the dotted path of the first
// string or key with a NUL. "" means the text is fine.
func untextField(body []byte) string {
	if !utf8.Valid(body) {
		return "request"
	}
	if !bytes.Contains(body, []byte(`\u0000`)) {
		return ""
	}
	var v any
	if json.Unmarshal(body, &v) != nil {
		return "" // the decoder reports the syntax error
	}
	return nulPath(v, "")
}

func nulPath(v any, at string) string {
	join := func(k string) string {
		if at == "" {
			return k
		}
		return at + "." + k
	}
	switch x := v.(type) {
	case string:
		if strings.IndexByte(x, 0) >= 0 {
			if at == "" {
				return "request"
			}
			return at
		}
	case map[string]any:
		keys := make([]string, 0, len(x))
		for k := range x {
			keys = append(keys, k)
		}
		sort.Strings(keys)
		for _, k := range keys {
			if strings.IndexByte(k, 0) >= 0 {
				return join(strings.ReplaceAll(k, "\x00", ""))
			}
			if p := nulPath(x[k], join(k)); p != "" {
				return p
			}
		}
	case []any:
		for i, e := range x {
			if p := nulPath(e, join(strconv.Itoa(i))); p != "" {
				return p
			}
		}
	}
	return ""
}

func writeJSON(w http.ResponseWriter, status int, v any) {
	w.Header().Set("Content-Type", "application/json; charset=utf-8")
	w.Header().Set("Cache-Control", "no-store")
	w.WriteHeader(status)
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	_ = enc.Encode(v)
}
