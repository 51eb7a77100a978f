package preview

import (
	"context"
	"errors"
	"log"
	"mime"
	"net"
	"net/http"
	"path"
	"strings"
	"sync"
	"time"

	"specgen/internal/site"
)

// Server builds a site into memory, serves it, and rebuilds when its
// sources change; open pages reload themselves. A failed build shows an
// overlay with the error over the last good site.
type Server struct {
	root     string
	logger   *log.Logger
	mu       sync.RWMutex
	files    map[string][]byte // last good build
	home     string            // its home page: what "/" shows
	buildErr error             // last build's error, nil when it succeeded
	changed  chan struct{}     // closed and replaced on every build
	builds   int               // counts builds
	// goodBuild is the number of the build that made files; pages carry
	// it, so that a page served before the latest build reloads.
	goodBuild int
}

// New builds the site at root once.
func New(root string, logger *log.Logger) *Server {
	p := &Server{root: root, logger: logger, changed: make(chan struct{})}
	p.rebuild()
	return p
}

// rebuild builds the site; on failure the last good files stay.
func (p *Server) rebuild() {
	start := time.Now()
	var files map[string][]byte
	home := "index.html"
	s, err := site.Load(p.root)
	if err == nil {
		home = s.Home()
		files, err = s.Render()
	}
	p.mu.Lock()
	if err == nil {
		p.files, p.home, p.goodBuild = files, home, p.builds+1
	}
	p.buildErr = err
	p.builds++
	close(p.changed)
	p.changed = make(chan struct{})
	p.mu.Unlock()
	if err != nil {
		p.logger.Printf("build failed:\n%v", err)
		return
	}
	p.logger.Printf("built %d files in %v", len(files), time.Since(start).Round(time.Millisecond))
}

// ServeHTTP serves the last good build, the reload script and the event
// stream.
func (p *Server) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	switch r.URL.Path {
	case scriptPath:
		w.Header().Set("Content-Type", "text/javascript; charset=utf-8")
		_, _ = w.Write([]byte(reloadScript))
		return
	case eventsPath:
		p.serveEvents(w, r)
		return
	}
	name := strings.TrimPrefix(path.Clean("/"+r.URL.Path), "/")
	p.mu.RLock()
	files, buildErr, home, goodBuild := p.files, p.buildErr, p.home, p.goodBuild
	p.mu.RUnlock()
	if name == "" {
		name = home
	}
	data, ok := files[name]
	if !ok {
		data, ok = files[path.Join(name, "index.html")]
		name = path.Join(name, "index.html")
	}
	if !ok {
		if files == nil && buildErr != nil {
			w.Header().Set("Content-Type", "text/html; charset=utf-8")
			w.WriteHeader(http.StatusInternalServerError)
			_, _ = w.Write(errorPage(buildErr))
			return
		}
		http.NotFound(w, r)
		return
	}
	ctype := mime.TypeByExtension(path.Ext(name))
	if ctype == "" {
		ctype = http.DetectContentType(data)
	}
	w.Header().Set("Content-Type", ctype)
	w.Header().Set("Cache-Control", "no-store")
	if strings.HasPrefix(ctype, "text/html") {
		data = injectReload(data, buildErr, goodBuild)
	}
	_, _ = w.Write(data)
}

// Serve listens on addr and serves the preview until ctx ends. ready, if
// not nil, receives the address actually listened on.
func (p *Server) Serve(ctx context.Context, addr string, ready chan<- string) error {
	ln, err := net.Listen("tcp", addr)
	if err != nil {
		return err
	}
	srv := &http.Server{Handler: p, ReadHeaderTimeout: 10 * time.Second}
	go func() {
		<-ctx.Done()
		shut, cancel := context.WithTimeout(context.Background(), time.Second)
		defer cancel()
		_ = srv.Shutdown(shut)
	}()
	if ready != nil {
		ready <- ln.Addr().String()
	}
	if err := srv.Serve(ln); err != nil && !errors.Is(err, http.ErrServerClosed) {
		return err
	}
	return nil
}
