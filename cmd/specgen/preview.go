package main

import (
	"context"
	"fmt"
	"io"
	"log"
	"os"
	"os/signal"
	"time"

	"specgen/internal/preview"
	"specgen/internal/site"
)

// previewDebounce gathers the burst of events one save makes.
const previewDebounce = 150 * time.Millisecond

func runPreview(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("preview", "preview [-C dir] [-addr 127.0.0.1:8080] [-public]", stderr)
	dir := fs.String("C", ".", "site root: the folder holding content/")
	addr := fs.String("addr", "127.0.0.1:8080", "address to serve on")
	public := fs.Bool("public", false, "allow an address other machines can reach")
	if code := parseFlags(fs, args); code >= 0 {
		return code
	}
	if err := site.CheckRoot(*dir); err != nil {
		return report(stderr, err)
	}
	if err := preview.CheckAddr(*addr, *public); err != nil {
		return report(stderr, err)
	}
	if *public {
		fmt.Fprintf(stderr, "specgen preview: warning: serving on %s; anyone who can reach it can read the site\n", *addr)
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	return servePreview(ctx, *dir, *addr, stdout, stderr, nil)
}

// servePreview runs the preview until ctx ends; ready receives the address.
func servePreview(ctx context.Context, dir, addr string, stdout, stderr io.Writer, ready chan<- string) int {
	logger := log.New(stderr, "specgen preview: ", 0)
	p := preview.New(dir, logger)
	go func() {
		if err := p.Watch(ctx, previewDebounce); err != nil {
			logger.Printf("not watching for changes: %v", err)
		}
	}()
	listening := make(chan string, 1)
	go func() {
		a := <-listening
		fmt.Fprintf(stdout, "serving http://%s/ (Ctrl-C stops)\n", a)
		if ready != nil {
			ready <- a
		}
	}()
	if err := p.Serve(ctx, addr, listening); err != nil {
		return report(stderr, err)
	}
	return exitOK
}
