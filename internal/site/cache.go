package site

import (
	"bytes"
	"crypto/sha256"
	"debug/elf"
	"encoding/gob"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"maps"
	"os"
	"path/filepath"
	"slices"
	"sort"
	"strings"
	"sync"
	"time"

	"github.com/millrace-workshop/specgen/internal/calc"
)

// CacheDir is the folder of a site root where specgen remembers its last
// builds. It is safe to delete; specgen never trusts it across versions of
// itself.
const CacheDir = ".specgen-cache"

// cacheFormat changes whenever the manifest's layout does.
const cacheFormat = 7

// manifest records one build: what went in (a fingerprint of every input
// and of the specgen binary), what came out, and what each page's output
// was made from.
type manifest struct {
	Format      int                   `json:"format"`
	Fingerprint string                `json:"fingerprint"`
	Pages       int                   `json:"pages"`
	Problems    []Problem             `json:"problems"`
	Tally       Tally                 `json:"tally"`
	Files       map[string]outputFile `json:"files"`
	// Record is the digest of the file beside it that holds the build's
	// buildRecord: read only when the build is not up to date. Render is
	// the record's render fingerprint, known without reading it.
	Record string `json:"record"`
	Render string `json:"render"`
	// Sources are the source files as the build looked at them.
	Sources sourceStats `json:"sources"`
}

// outputFile is what a written file looked like, to notice later edits.
type outputFile struct {
	Size    int64 `json:"size"`
	ModTime int64 `json:"mtime_ns"`
}

// fingerprint hashes everything a build reads: the specgen binary, the
// output folder, the git revision shown on data sheets, specgen.toml and
// every file under content/, templates/ and static/. A file whose status
// is as last recorded, and was already then older than racyAge, is taken
// at the hash recorded. It returns the revision too, which the build then
// shows, the hash of each file of content/ by its path from there, and
// what the next build may take over.
func fingerprint(root, out string, last *manifest) (string, *Revision, map[string][sha256.Size]byte, sourceStats, error) {
	h := sha256.New()
	self, err := binaryHash()
	if err != nil {
		return "", nil, nil, sourceStats{}, err
	}
	fmt.Fprintf(h, "specgen %s\nout %s\n", self, out)
	taken := time.Now().UnixNano()
	// git runs while the files are read.
	revision := make(chan *Revision, 1)
	go func() { revision <- revisionOf(root) }()
	paths := []string{filepath.Join(root, ConfigFile)}
	for _, dir := range []string{ContentDir, TemplatesDir, StaticDir} {
		_ = filepath.WalkDir(filepath.Join(root, dir), func(p string, d fs.DirEntry, err error) error {
			if err == nil && !d.IsDir() {
				paths = append(paths, p)
			}
			return nil
		})
	}
	sort.Strings(paths)
	var trusted map[string]sourceStat
	if last != nil {
		trusted = last.Sources.Files
	}
	// Files are hashed in parallel, each on its own, then in order.
	lines := make([][]byte, len(paths))
	stats := make([]sourceStat, len(paths))
	errs := make([]error, len(paths))
	calc.Parallel(len(paths), func(i int) {
		rel, _ := filepath.Rel(root, paths[i])
		rel = filepath.ToSlash(rel)
		was, ok := trusted[rel]
		lines[i], stats[i], errs[i] = fileDigest(rel, paths[i], was, ok && last.Sources.settled(was))
	})
	r := <-revision
	if r != nil {
		fmt.Fprintf(h, "revision %s %s %v\n", r.Commit, r.Date, r.Modified)
	}
	content := filepath.Join(root, ContentDir) + string(filepath.Separator)
	bySource := make(map[string][sha256.Size]byte, len(paths))
	next := sourceStats{Taken: taken, Files: make(map[string]sourceStat, len(paths))}
	for i, p := range paths {
		if errs[i] != nil {
			return "", nil, nil, sourceStats{}, errs[i]
		}
		if lines[i] == nil {
			continue
		}
		h.Write(lines[i])
		rel, _ := filepath.Rel(root, p)
		next.Files[filepath.ToSlash(rel)] = stats[i]
		if rel, ok := strings.CutPrefix(p, content); ok {
			bySource[filepath.ToSlash(rel)] = stats[i].Sum
		}
	}
	return hex.EncodeToString(h.Sum(nil)), r, bySource, next, nil
}

// racyAge is how long before a build's look at the sources a file must
// have last changed for the next build to take its hash from that look:
// a file changed within the same tick of the disk's clock as it was
// looked at could change again without its status showing it. It is
// wider than any disk's tick (two seconds on FAT). Tests shorten it.
var racyAge = 3 * time.Second

// sourceStats are the source files as one build looked at them: when,
// and each file's status and hash, by path from the site root.
type sourceStats struct {
	Taken int64                 `json:"taken_ns"`
	Files map[string]sourceStat `json:"files"`
}

// sourceStat is a file's status (size, mode, inode, modification and
// change times: any write changes the change time, which cannot be set
// back) and the hash of its contents.
type sourceStat struct {
	Size  int64             `json:"size"`
	Mode  uint32            `json:"mode"`
	Inode uint64            `json:"ino"`
	MTime int64             `json:"mtime_ns"`
	CTime int64             `json:"ctime_ns"`
	Sum   [sha256.Size]byte `json:"-"`
	Hash  string            `json:"sha256"`
}

// settled reports whether a file recorded in these stats had last changed
// well before they were taken, so that a change since shows in its status.
func (s sourceStats) settled(f sourceStat) bool {
	limit := s.Taken - int64(racyAge)
	return f.CTime != 0 && f.MTime < limit && f.CTime < limit
}

// statOf is a file's status, without its hash; the change time is 0
// where the system does not tell it.
func statOf(info fs.FileInfo) sourceStat {
	inode, ctime := inodeAndChangeTime(info)
	return sourceStat{Size: info.Size(), Mode: uint32(info.Mode()), Inode: inode, MTime: info.ModTime().UnixNano(), CTime: ctime}
}

// same reports whether two statuses are of one unchanged file.
func (f sourceStat) same(g sourceStat) bool {
	return f.Size == g.Size && f.Mode == g.Mode && f.Inode == g.Inode && f.MTime == g.MTime && f.CTime == g.CTime
}

// fileDigest identifies a file by its path from the root, its mode and
// the hash of its contents, which it returns with its status; a missing
// file gives nothing. A file whose status is as was, trusted, is taken at
// was's hash.
func fileDigest(rel, p string, was sourceStat, trusted bool) ([]byte, sourceStat, error) {
	info, err := os.Lstat(p)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, sourceStat{}, nil
	}
	if err != nil {
		return nil, sourceStat{}, err
	}
	st := statOf(info)
	switch {
	case trusted && st.same(was) && was.Hash != "":
		if _, err := hex.Decode(st.Sum[:], []byte(was.Hash)); err != nil {
			return fileDigest(rel, p, was, false)
		}
	case info.Mode().IsRegular():
		data, err := os.ReadFile(p)
		if err != nil {
			return nil, sourceStat{}, err
		}
		st.Sum = sha256.Sum256(data)
	}
	st.Hash = hex.EncodeToString(st.Sum[:])
	return fmt.Appendf(nil, "file %q %v %x\n", rel, info.Mode(), st.Sum), st, nil
}

// binaryHash identifies the running specgen, so that a cache never
// outlives the code that wrote it. Tests stand another binary in.
var binaryHash = sync.OnceValues(func() (string, error) {
	exe, err := os.Executable()
	if err != nil {
		return "", err
	}
	return executableID(exe)
})

// executableID identifies an executable by the build ID the Go linker
// writes into an ELF file, whose last part hashes the file's content,
// read in microseconds; else (another format, or no build ID) by the
// hash of the whole file.
func executableID(exe string) (string, error) {
	if id := goBuildID(exe); id != "" {
		return "go build ID " + id, nil
	}
	f, err := os.Open(exe)
	if err != nil {
		return "", err
	}
	defer f.Close()
	h := sha256.New()
	if _, err := io.Copy(h, f); err != nil {
		return "", err
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// goBuildID reads the Go build ID of an ELF executable from its note,
// "" when it has none. The ID's last part, after a slash, is the content
// ID, the hash of the linked file; an ID without one is not taken.
func goBuildID(exe string) string {
	f, err := elf.Open(exe)
	if err != nil {
		return ""
	}
	defer f.Close()
	s := f.Section(".note.go.buildid")
	if s == nil {
		return ""
	}
	note, err := s.Data()
	if err != nil || len(note) < 16 {
		return ""
	}
	nameSize, descSize, tag := f.ByteOrder.Uint32(note), f.ByteOrder.Uint32(note[4:]), f.ByteOrder.Uint32(note[8:])
	const goBuildIDTag = 4
	descAt := 12 + (uint64(nameSize)+3)&^3
	if tag != goBuildIDTag || nameSize != 4 || string(note[12:16]) != "Go\x00\x00" || descAt+uint64(descSize) > uint64(len(note)) {
		return ""
	}
	id := string(note[descAt : descAt+uint64(descSize)])
	if i := strings.LastIndexByte(id, '/'); i < 0 || i == len(id)-1 {
		return ""
	}
	return id
}

// manifestPath is where the manifest for an output folder lives.
func manifestPath(root, out string) string {
	sum := sha256.Sum256([]byte(out))
	return filepath.Join(root, CacheDir, fmt.Sprintf("build-v%d-%s.gob", cacheFormat, hex.EncodeToString(sum[:8])))
}

// readManifest reads the manifest of the last build into out, nil when
// there is none this specgen can read.
func readManifest(root, out string) *manifest {
	b, err := os.ReadFile(manifestPath(root, out))
	if err != nil {
		return nil
	}
	var m manifest
	if gob.NewDecoder(bytes.NewReader(b)).Decode(&m) != nil || m.Format != cacheFormat {
		return nil
	}
	return &m
}

// intact reports whether the last build's output in out is as it left it.
func (m *manifest) intact(out string) bool {
	if m == nil {
		return false
	}
	seen := 0
	ok := true
	err := filepath.WalkDir(out, func(p string, d fs.DirEntry, err error) error {
		if err != nil || !ok {
			return err
		}
		if d.IsDir() {
			return nil
		}
		rel, _ := filepath.Rel(out, p)
		want, listed := m.Files[filepath.ToSlash(rel)]
		info, ierr := d.Info()
		if !listed || ierr != nil || !want.is(info) {
			ok = false
			return nil
		}
		seen++
		return nil
	})
	return err == nil && ok && seen == len(m.Files)
}

// is reports whether a file is as it was recorded.
func (f outputFile) is(info fs.FileInfo) bool {
	return info.Mode().IsRegular() && info.Size() == f.Size && info.ModTime().UnixNano() == f.ModTime
}

// lastOutput is the output folder of the last build with its manifest:
// the files an incremental build may take over.
type lastOutput struct {
	dir    string
	files  map[string]outputFile
	record *buildRecord
	// intact: every file was found as recorded just before this build.
	intact bool
}

// reusable is the last build's output in root's out, nil when there is
// nothing to take over: no record, or not the one the manifest names.
func (m *manifest) reusable(root, out string, intact bool) *lastOutput {
	if m == nil || m.Record == "" {
		return nil
	}
	b, err := os.ReadFile(recordPath(root, out))
	if err != nil || sha256Hex(b) != m.Record {
		return nil
	}
	r, err := readRecord(bytes.NewReader(b))
	if err != nil {
		return nil
	}
	return &lastOutput{dir: out, files: m.Files, record: r, intact: intact}
}

// recordPage is one page of a record's file.
type recordPage struct {
	File string
	Page pageRecord
}

// writeRecord writes a build's record as a gob stream: the record without
// its pages, then each page, in order, so that no message is big.
func writeRecord(w io.Writer, r *buildRecord) error {
	enc := gob.NewEncoder(w)
	if err := enc.Encode(buildRecord{Render: r.Render, Results: r.Results, Entries: r.Entries}); err != nil {
		return err
	}
	for _, file := range slices.Sorted(maps.Keys(r.Pages)) {
		if err := enc.Encode(recordPage{File: file, Page: r.Pages[file]}); err != nil {
			return err
		}
	}
	return nil
}

// readRecord reads what writeRecord wrote.
func readRecord(rd io.Reader) (*buildRecord, error) {
	dec := gob.NewDecoder(rd)
	var r buildRecord
	if err := dec.Decode(&r); err != nil {
		return nil, err
	}
	r.Pages = map[string]pageRecord{}
	for {
		var p recordPage
		switch err := dec.Decode(&p); {
		case err == io.EOF:
			return &r, nil
		case err != nil:
			return nil, err
		}
		r.Pages[p.File] = p.Page
	}
}

// rendersLike reports whether the last build rendered its pages as the
// site at root renders them now: then most pages will be taken over, and
// are best rendered only when written.
func (m *manifest) rendersLike(root string) bool {
	if m == nil || m.Record == "" {
		return false
	}
	fp, err := renderFingerprint(root)
	return err == nil && fp == m.Render
}

// recordPath is where the buildRecord of an output folder's manifest lives.
func recordPath(root, out string) string {
	return strings.TrimSuffix(manifestPath(root, out), ".gob") + ".pages.gob"
}

func sha256Hex(b []byte) string {
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:])
}

// linkInto takes the last build's file name into the staging folder dir:
// a hard link, or a copy where the disk has none. It reports false when
// the file is no longer as the last build left it.
func (l *lastOutput) linkInto(dir, name string) bool {
	if l == nil {
		return false
	}
	want, ok := l.files[name]
	if !ok {
		return false
	}
	from := filepath.Join(l.dir, filepath.FromSlash(name))
	if !l.intact {
		if info, err := os.Lstat(from); err != nil || !want.is(info) {
			return false
		}
	}
	to := filepath.Join(dir, filepath.FromSlash(name))
	err := os.Link(from, to)
	if errors.Is(err, fs.ErrNotExist) {
		// The staging folder lacks the file's folder yet.
		if os.MkdirAll(filepath.Dir(to), 0o755) != nil {
			return false
		}
		err = os.Link(from, to)
	}
	return err == nil || copyFile(from, to) == nil
}

// open opens the last build's file name, nil when it is no longer as
// that build left it.
func (l *lastOutput) open(name string) lastFile {
	if l == nil {
		return nil
	}
	want, ok := l.files[name]
	if !ok {
		return nil
	}
	f, err := os.Open(filepath.Join(l.dir, filepath.FromSlash(name)))
	if err != nil {
		return nil
	}
	if info, err := f.Stat(); err != nil || !want.is(info) {
		f.Close()
		return nil
	}
	return f
}

// copyFile copies a file, keeping its modification time, so that the
// copy is recorded as the last build recorded the original.
func copyFile(from, to string) error {
	src, err := os.Open(from)
	if err != nil {
		return err
	}
	defer src.Close()
	info, err := src.Stat()
	if err != nil {
		return err
	}
	dst, err := os.OpenFile(to, os.O_CREATE|os.O_WRONLY|os.O_EXCL, 0o644)
	if err != nil {
		return err
	}
	_, err = io.Copy(dst, src)
	if cerr := dst.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		return err
	}
	return os.Chtimes(to, info.ModTime(), info.ModTime())
}

// remember writes the manifest of a finished build. A cache that cannot
// be written only costs the next build its shortcut.
func remember(root, out, fp string, sources sourceStats, pages int, problems []Problem, tally Tally, record *buildRecord, files map[string]outputFile) {
	m := manifest{Format: cacheFormat, Fingerprint: fp, Sources: sources, Pages: pages, Problems: problems, Tally: tally, Files: files}
	if files != nil {
		writeManifest(root, out, m, record)
		return
	}
	m.Files = map[string]outputFile{}
	err := filepath.WalkDir(out, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		info, err := d.Info()
		if err != nil {
			return err
		}
		rel, _ := filepath.Rel(out, p)
		m.Files[filepath.ToSlash(rel)] = outputFile{Size: info.Size(), ModTime: info.ModTime().UnixNano()}
		return nil
	})
	if err != nil {
		return
	}
	writeManifest(root, out, m, record)
}

// writeManifest writes a finished build's manifest and record.
func writeManifest(root, out string, m manifest, record *buildRecord) {
	dir := filepath.Join(root, CacheDir)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return
	}
	_ = os.WriteFile(filepath.Join(dir, "README"), []byte("specgen's build cache: safe to delete.\n"), 0o644)
	// The record first, then the manifest that names it by its digest: a
	// record without its manifest is never trusted.
	if record != nil {
		var rb bytes.Buffer
		rb.Grow(len(record.Pages) << 11)
		if writeRecord(&rb, record) == nil && writeAside(recordPath(root, out), rb.Bytes()) == nil {
			m.Record, m.Render = sha256Hex(rb.Bytes()), record.Render
		}
	}
	// gob: some thousand files' states read and written at every build,
	// several times faster than as JSON.
	var b bytes.Buffer
	if gob.NewEncoder(&b).Encode(m) == nil {
		_ = writeAside(manifestPath(root, out), b.Bytes())
	}
}

// writeAside writes a file whole or not at all: aside, then renamed.
func writeAside(path string, data []byte) error {
	tmp := path + ".tmp"
	if err := os.WriteFile(tmp, data, 0o644); err != nil {
		return err
	}
	return os.Rename(tmp, path)
}

// pending is what a cache file holds while it is read in the background;
// its value is the zero value when the file is missing, damaged or of
// another catalog.
type pending[T any] struct {
	ready chan struct{}
	v     T
}

// readingCache starts reading a file of root's cache with read, handed
// the cache folder and the namespace of the catalog the build uses.
func readingCache[T any](root string, read func(dir, namespace string) T) *pending[T] {
	p := &pending[T]{ready: make(chan struct{})}
	go func() {
		defer close(p.ready)
		if ns, err := outcomesNamespace(root); err == nil {
			p.v = read(filepath.Join(root, CacheDir), ns)
		}
	}()
	return p
}

// wait waits for the file to be read and returns what it holds.
func (p *pending[T]) wait() T {
	<-p.ready
	return p.v
}
