package server

import (
	"bytes"
	"context"
	"net/http"
	"strconv"
	"sync"

	"github.com/a-h/templ"
)

// pageBuffers are reused between responses; a buffer that grew past
// maxPooledPage (a long plan page) is left to the collector.
var pageBuffers = sync.Pool{New: func() any { return new(bytes.Buffer) }}

const maxPooledPage = 1 << 20

// writePage renders c whole, then sends it with its length. A page larger
// than net/http's small first buffer would otherwise go out in chunked
// encoding, in several writes; with its length it goes in one. The status
// is written after rendering, so a template that fails answers 500
// instead of half a page under a 200.
func writePage(ctx context.Context, w http.ResponseWriter, status int, c templ.Component) error {
	buf := pageBuffers.Get().(*bytes.Buffer)
	buf.Reset()
	defer func() {
		if buf.Cap() <= maxPooledPage {
			pageBuffers.Put(buf)
		}
	}()
	if err := c.Render(ctx, buf); err != nil {
		http.Error(w, "Something went wrong on our side. Please try again.", http.StatusInternalServerError)
		return err
	}
	w.Header().Set("Content-Length", strconv.Itoa(buf.Len()))
	w.WriteHeader(status)
	_, err := w.Write(buf.Bytes())
	return err
}

// renderPage renders c whole into a byte slice of its own, for a page kept
// after this response (a pooled buffer would be reused under it).
func renderPage(ctx context.Context, c templ.Component) ([]byte, error) {
	buf := pageBuffers.Get().(*bytes.Buffer)
	buf.Reset()
	defer func() {
		if buf.Cap() <= maxPooledPage {
			pageBuffers.Put(buf)
		}
	}()
	if err := c.Render(ctx, buf); err != nil {
		return nil, err
	}
	return bytes.Clone(buf.Bytes()), nil
}

// writeBody sends a rendered page with its length and status 200.
func writeBody(w http.ResponseWriter, body []byte) {
	w.Header().Set("Content-Length", strconv.Itoa(len(body)))
	w.WriteHeader(http.StatusOK)
	_, _ = w.Write(body)
}
