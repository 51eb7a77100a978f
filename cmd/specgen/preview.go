package main

import (
	"context"
	"fmt"
	"io"
	"log"
	"os"
	"os/signal"
	"strings"
	"time"

	"github.com/millrace-workshop/specgen/internal/preview"
	"github.com/millrace-workshop/specgen/internal/site"
)

// previewDebounce gathers the burst of events one save makes.
const previewDebounce = 150 * time.Millisecond

func runPreview(args []string, stdout, stderr io.Writer) int {
	fs := newFlags("preview", "preview [-C dir] [-addr 127.0.0.1:8080] [-public] [-allow-host NAME]...\n\n"+
		"Serves the site and rebuilds it as you edit. It answers only requests for its own address, localhost\n"+
		"and 127.0.0.1/[::1] (other pages cannot read it through a name of theirs); -allow-host adds a name,\n"+
		"such as a proxy's, and -public the machine's own addresses.", stderr)
	dir := fs.String("C", ".", "site root: the folder holding content/")
	addr := fs.String("addr", "127.0.0.1:8080", "address to serve on")
	public := fs.Bool("public", false, "allow an address other machines can reach, and answer to the machine's own addresses")
	var allow []string
	fs.Func("allow-host", "also answer requests for host `NAME` (repeatable), such as a proxy's name", func(name string) error {
		allow = append(allow, name)
		return nil
	})
	if code := parseFlags(fs, args); code >= 0 {
		return code
	}
	for _, name := range allow {
		if err := preview.CheckHostName(name); err != nil {
			return report(stderr, err)
		}
	}
	if err := site.CheckRoot(*dir); err != nil {
		return report(stderr, err)
	}
	if err := preview.CheckAddr(*addr, *public); err != nil {
		return report(stderr, err)
	}
	opts := []preview.Option{preview.AllowHosts(allow...)}
	if *public {
		opts = append(opts, preview.Public())
	}
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	return servePreview(ctx, *dir, *addr, stdout, stderr, nil, opts...)
}

// servePreview runs the preview until ctx ends; ready receives the address.
func servePreview(ctx context.Context, dir, addr string, stdout, stderr io.Writer, ready chan<- string, opts ...preview.Option) int {
	logger := log.New(stderr, "specgen preview: ", 0)
	p := preview.New(dir, logger, opts...)
	go func() {
		if err := p.Watch(ctx, previewDebounce); err != nil {
			logger.Printf("not watching for changes: %v", err)
		}
	}()
	listening := make(chan string, 1)
	go func() {
		a := <-listening
		fmt.Fprintln(stdout, startupLine(a))
		if ready != nil {
			ready <- a
		}
	}()
	if err := p.Serve(ctx, addr, listening); err != nil {
		return report(stderr, err)
	}
	return exitOK
}

// startupLine says where the preview is served and, when other machines
// can reach it, that anyone who can may read the site.
func startupLine(addr string) string {
	line := fmt.Sprintf("serving http://%s/ (Ctrl-C stops)", addr)
	urls, reachable := preview.NetworkURLs(addr)
	if !reachable {
		return line
	}
	line += "; reachable from the network"
	if len(urls) > 0 {
		line += " at " + strings.Join(urls, ", ")
	}
	return line + ": anyone who can reach it can read the site"
}
