package preview

import (
	"context"
	"errors"
	"fmt"
	"log"
	"mime"
	"net"
	"net/http"
	"path"
	"strings"
	"sync"
	"time"

	"github.com/millrace-workshop/specgen/internal/site"
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

	allowHosts []string // names answered besides the preview's own address
	public     bool     // the machine's own addresses are answered too
	refusedMu  sync.Mutex
	refused    map[string]bool // Host names refused and logged
}

// Option configures a Server.
type Option func(*Server)

// AllowHosts answers requests for names (host names or addresses, on any
// port) besides the preview's own address, localhost and 127.0.0.1/[::1]:
// the name of a proxy in front of the preview, say. Give names checked
// with CheckHostName.
func AllowHosts(names ...string) Option {
	return func(p *Server) { p.allowHosts = append(p.allowHosts, names...) }
}

// Public answers requests for the machine's own addresses and host name
// too, for a preview served to the network.
func Public() Option {
	return func(p *Server) { p.public = true }
}

// New builds the site at root once.
func New(root string, logger *log.Logger, opts ...Option) *Server {
	p := &Server{root: root, logger: logger, changed: make(chan struct{}), refused: map[string]bool{}}
	for _, o := range opts {
		o(p)
	}
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

// contentPolicy lets pages use only the site's own files: no inline
// script or style, nothing from elsewhere, no framing by other sites.
const contentPolicy = "default-src 'self'; object-src 'none'; base-uri 'none'; form-action 'self'; frame-ancestors 'self'"

// handler guards serve for a preview listening on listen (host:port):
// requests for another host get 421, cross-site requests 403, and every
// response forbids content sniffing and carries the content policy.
func (p *Server) handler(listen string) http.Handler {
	h := newHosts(listen, p.allowHosts, p.public)
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		w.Header().Set("X-Content-Type-Options", "nosniff")
		w.Header().Set("Content-Security-Policy", contentPolicy)
		if !h.allowsHost(r.Host) {
			p.logRefused(r.Host)
			http.Error(w, fmt.Sprintf("specgen preview answers only to its own address (%s), localhost and the names given with -allow-host, not to %q", listen, r.Host), http.StatusMisdirectedRequest)
			return
		}
		if origin := r.Header.Get("Origin"); origin != "" && !h.allowsOrigin(origin) {
			http.Error(w, fmt.Sprintf("specgen preview refuses requests from pages of other sites (origin %q)", origin), http.StatusForbidden)
			return
		}
		if r.Method != http.MethodGet && r.Method != http.MethodHead {
			w.Header().Set("Allow", "GET, HEAD")
			http.Error(w, "specgen preview only serves pages: GET and HEAD", http.StatusMethodNotAllowed)
			return
		}
		p.serve(w, r)
	})
}

// maxRefusedLogged bounds how many refused names are logged: a page can
// make up any number of them.
const maxRefusedLogged = 20

// logRefused tells the user, once for each name, that requests for it were
// refused: either a page elsewhere is trying to read the preview, or a
// proxy of the user's own needs -allow-host.
func (p *Server) logRefused(host string) {
	p.refusedMu.Lock()
	first := !p.refused[host] && len(p.refused) < maxRefusedLogged
	if first {
		p.refused[host] = true
	}
	p.refusedMu.Unlock()
	if first {
		p.logger.Printf("refused requests for host %q (421): a page on another site may be trying to read the preview; if the name is your own proxy's, add -allow-host NAME", host)
	}
}

// serve serves the last good build, the reload script, the overlay's
// style and the event stream.
func (p *Server) serve(w http.ResponseWriter, r *http.Request) {
	switch r.URL.Path {
	case scriptPath:
		w.Header().Set("Content-Type", "text/javascript; charset=utf-8")
		_, _ = w.Write([]byte(reloadScript))
		return
	case stylePath:
		w.Header().Set("Content-Type", "text/css; charset=utf-8")
		_, _ = w.Write([]byte(overlayStyle))
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
	srv := &http.Server{Handler: p.handler(ln.Addr().String()), ReadHeaderTimeout: 10 * time.Second}
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
