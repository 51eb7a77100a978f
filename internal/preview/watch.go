package preview

import (
	"context"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"time"

	"github.com/fsnotify/fsnotify"

	"github.com/millrace-workshop/specgen/internal/site"
)

// Watch rebuilds on changes to content/, templates/, static/ and
// specgen.toml until ctx ends. Changes within debounce are one rebuild.
func (p *Server) Watch(ctx context.Context, debounce time.Duration) error {
	w, err := fsnotify.NewWatcher()
	if err != nil {
		return err
	}
	defer w.Close()
	if err := w.Add(p.root); err != nil {
		return err
	}
	for _, dir := range []string{site.ContentDir, site.TemplatesDir, site.StaticDir} {
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
func (p *Server) relevant(name string) bool {
	rel, err := filepath.Rel(p.root, name)
	if err != nil {
		return false
	}
	rel = filepath.ToSlash(rel)
	if rel == site.ConfigFile {
		return true
	}
	top, _, _ := strings.Cut(rel, "/")
	return top == site.ContentDir || top == site.TemplatesDir || top == site.StaticDir
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
