package site

import (
	"bytes"
	"context"
	"errors"
	"fmt"
	"html"
	"io/fs"
	"log"
	"mime"
	"net"
	"net/http"
	"os"
	"path"
	"path/filepath"
	"strconv"
	"strings"
	"sync"
	"time"

	"github.com/fsnotify/fsnotify"
)

// Preview builds a site into memory, serves it, and rebuilds when its
// sources change; open pages reload themselves. A failed build shows an
// overlay with the error over the last good site.
type Preview struct {
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

// NewPreview builds the site at root once.
func NewPreview(root string, logger *log.Logger) *Preview {
	p := &Preview{root: root, logger: logger, changed: make(chan struct{})}
	p.rebuild()
	return p
}

// rebuild builds the site; on failure the last good files stay.
func (p *Preview) rebuild() {
	start := time.Now()
	var files map[string][]byte
	home := "index.html"
	s, err := Load(p.root)
	if err == nil {
		home = s.home()
		files, err = s.render(nil)
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

// Watch rebuilds on changes to content/, templates/, static/ and
// specgen.toml until ctx ends. Changes within debounce are one rebuild.
func (p *Preview) Watch(ctx context.Context, debounce time.Duration) error {
	w, err := fsnotify.NewWatcher()
	if err != nil {
		return err
	}
	defer w.Close()
	if err := w.Add(p.root); err != nil {
		return err
	}
	for _, dir := range []string{ContentDir, TemplatesDir, StaticDir} {
		addTree(w, filepath.Join(p.root, dir))
	}
	var timer <-chan time.Time
	for {
		select {
		case <-ctx.Done():
			return nil
		case ev, ok := <-w.Events:
			if !ok {
				return nil
			}
			if !p.relevant(ev.Name) {
				continue
			}
			if ev.Has(fsnotify.Create) {
				if info, err := os.Stat(ev.Name); err == nil && info.IsDir() {
					addTree(w, ev.Name)
				}
			}
			timer = time.After(debounce)
		case err, ok := <-w.Errors:
			if !ok {
				return nil
			}
			p.logger.Printf("watching: %v", err)
		case <-timer:
			timer = nil
			p.rebuild()
		}
	}
}

// relevant reports whether a changed path is a source of the site.
func (p *Preview) relevant(name string) bool {
	rel, err := filepath.Rel(p.root, name)
	if err != nil {
		return false
	}
	rel = filepath.ToSlash(rel)
	if rel == ConfigFile {
		return true
	}
	top, _, _ := strings.Cut(rel, "/")
	return top == ContentDir || top == TemplatesDir || top == StaticDir
}

// addTree watches dir and every folder below it.
func addTree(w *fsnotify.Watcher, dir string) {
	_ = filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err == nil && d.IsDir() {
			_ = w.Add(p)
		}
		return nil
	})
}

// The preview's own URLs; no site file can have these names, since a
// site's files never start with "_specgen".
const (
	previewScriptPath = "/_specgen/reload.js"
	previewEventsPath = "/_specgen/events"
)

// previewScript reloads the page when the site is rebuilt and shows a
// build error over the page. It is served only by preview, never built.
const previewScript = `(function () {
  var box = null;
  function show(msg) {
    if (!box) {
      box = document.createElement("div");
      box.id = "sg-preview-error";
      box.setAttribute("role", "alert");
      box.style.cssText = "position:fixed;inset:auto 1rem 1rem 1rem;max-height:60vh;overflow:auto;z-index:9999;" +
        "background:#fff;color:#111;border:3px solid #b3261e;padding:1rem;font:14px/1.45 ui-monospace,monospace;" +
        "white-space:pre-wrap;box-shadow:0 4px 16px rgba(0,0,0,.3)";
      document.body.appendChild(box);
    }
    box.textContent = "specgen preview: the build failed; showing the last good site.\n\n" + msg;
  }
  var es = new EventSource("` + previewEventsPath + `");
  var built = (document.currentScript && document.currentScript.dataset.build) || "";
  es.addEventListener("reload", function () { location.reload(); });
  // On connecting, the server names its latest good build: a page served
  // before it (an edit while this page was loading) reloads at once.
  es.addEventListener("hello", function (e) { if (built && e.data !== built) { location.reload(); } });
  es.addEventListener("failed", function (e) { show(e.data); });
})();
`

// ServeHTTP serves the last good build, the reload script and the event
// stream.
func (p *Preview) ServeHTTP(w http.ResponseWriter, r *http.Request) {
	switch r.URL.Path {
	case previewScriptPath:
		w.Header().Set("Content-Type", "text/javascript; charset=utf-8")
		_, _ = w.Write([]byte(previewScript))
		return
	case previewEventsPath:
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
		data = injectPreview(data, buildErr, goodBuild)
	}
	_, _ = w.Write(data)
}

// injectPreview adds the reload script, and the error overlay when the
// last build failed, before </body>.
func injectPreview(page []byte, buildErr error, build int) []byte {
	extra := `<script src="` + previewScriptPath + `" data-build="` + strconv.Itoa(build) + `"></script>`
	if buildErr != nil {
		extra = `<div id="sg-preview-error" role="alert" style="position:fixed;inset:auto 1rem 1rem 1rem;max-height:60vh;overflow:auto;z-index:9999;background:#fff;color:#111;border:3px solid #b3261e;padding:1rem;font:14px/1.45 ui-monospace,monospace;white-space:pre-wrap">specgen preview: the build failed; showing the last good site.` +
			"\n\n" + html.EscapeString(buildErr.Error()) + `</div>` + extra
	}
	i := bytes.LastIndex(page, []byte("</body>"))
	if i < 0 {
		return append(append([]byte{}, page...), extra...)
	}
	out := make([]byte, 0, len(page)+len(extra))
	out = append(out, page[:i]...)
	out = append(out, extra...)
	return append(out, page[i:]...)
}

// errorPage is shown when there has never been a good build.
func errorPage(err error) []byte {
	return []byte(`<!DOCTYPE html><html lang="en"><head><meta charset="utf-8"><title>Build failed</title></head><body>` +
		`<h1>specgen preview: the build failed</h1><pre>` + html.EscapeString(err.Error()) + `</pre>` +
		`<script src="` + previewScriptPath + `"></script></body></html>`)
}

// serveEvents streams "reload" after every good build and "failed" with
// the message after every failed one.
func (p *Preview) serveEvents(w http.ResponseWriter, r *http.Request) {
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

// CheckPreviewAddr refuses an address that is not on the loopback
// interface unless public is set.
func CheckPreviewAddr(addr string, public bool) error {
	host, _, err := net.SplitHostPort(addr)
	if err != nil {
		return &Error{Msg: fmt.Sprintf("-addr %q: %v; write host:port, such as 127.0.0.1:8080", addr, err)}
	}
	if host == "localhost" {
		return nil
	}
	ip := net.ParseIP(host)
	if ip != nil && ip.IsLoopback() {
		return nil
	}
	if !public {
		return &Error{Msg: fmt.Sprintf("-addr %q is not a loopback address; the preview would be reachable from other machines. Add -public to allow it", addr)}
	}
	return nil
}

// Serve listens on addr and serves the preview until ctx ends. ready, if
// not nil, receives the address actually listened on.
func (p *Preview) Serve(ctx context.Context, addr string, ready chan<- string) error {
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
