package preview

import (
	"fmt"
	"net/http"
	"strconv"
	"strings"
)

// serveEvents streams "reload" after every good build and "failed" with
// the message after every failed one.
func (p *Server) serveEvents(w http.ResponseWriter, r *http.Request) {
	flusher, ok := w.(http.Flusher)
	if !ok {
		http.Error(w, "streaming unsupported", http.StatusInternalServerError)
		return
	}
	w.Header().Set("Content-Type", "text/event-stream")
	w.Header().Set("Cache-Control", "no-store")
	p.mu.RLock()
	changed, buildErr, good := p.changed, p.buildErr, p.goodBuild
	p.mu.RUnlock()
	writeEvent(w, "hello", strconv.Itoa(good))
	if buildErr != nil {
		writeEvent(w, "failed", buildErr.Error())
	}
	_, _ = fmt.Fprint(w, ": connected\n\n")
	flusher.Flush()
	for {
		select {
		case <-r.Context().Done():
			return
		case <-changed:
		}
		p.mu.RLock()
		changed, buildErr = p.changed, p.buildErr
		p.mu.RUnlock()
		if buildErr != nil {
			writeEvent(w, "failed", buildErr.Error())
		} else {
			writeEvent(w, "reload", "")
		}
		flusher.Flush()
	}
}

func writeEvent(w http.ResponseWriter, name, data string) {
	_, _ = fmt.Fprintf(w, "event: %s\n", name)
	for _, line := range strings.Split(data, "\n") {
		_, _ = fmt.Fprintf(w, "data: %s\n", line)
	}
	_, _ = fmt.Fprint(w, "\n")
}
