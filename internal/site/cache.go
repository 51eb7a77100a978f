package site

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"sync"
)

// CacheDir is the folder of a site root where specgen remembers its last
// builds. It is safe to delete; specgen never trusts it across versions of
// itself.
const CacheDir = ".specgen-cache"

// cacheFormat changes whenever the manifest's layout does.
const cacheFormat = 2

// manifest records one build: what went in (a fingerprint of every input
// and of the specgen binary) and what came out.
type manifest struct {
	Format      int                   `json:"format"`
	Fingerprint string                `json:"fingerprint"`
	Pages       int                   `json:"pages"`
	Problems    []Problem             `json:"problems"`
	Tally       Tally                 `json:"tally"`
	Files       map[string]outputFile `json:"files"`
}

// outputFile is what a written file looked like, to notice later edits.
type outputFile struct {
	Size    int64 `json:"size"`
	ModTime int64 `json:"mtime_ns"`
}

// fingerprint hashes everything a build reads: the specgen binary, the
// output folder, the git revision shown on data sheets, specgen.toml and
// every file under content/, templates/ and static/.
func fingerprint(root, out string) (string, error) {
	h := sha256.New()
	self, err := binaryHash()
	if err != nil {
		return "", err
	}
	fmt.Fprintf(h, "specgen %s\nout %s\n", self, out)
	if r := revisionOf(root); r != nil {
		fmt.Fprintf(h, "revision %s %s %v\n", r.Commit, r.Date, r.Modified)
	}
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
	for _, p := range paths {
		info, err := os.Lstat(p)
		if errors.Is(err, fs.ErrNotExist) {
			continue
		}
		if err != nil {
			return "", err
		}
		rel, _ := filepath.Rel(root, p)
		fmt.Fprintf(h, "file %s %v ", filepath.ToSlash(rel), info.Mode())
		if info.Mode().IsRegular() {
			f, err := os.Open(p)
			if err != nil {
				return "", err
			}
			_, err = io.Copy(h, f)
			f.Close()
			if err != nil {
				return "", err
			}
		}
		h.Write([]byte{0})
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

var (
	selfHash     string
	selfHashErr  error
	selfHashOnce sync.Once
)

// binaryHash identifies the running specgen by the hash of its
// executable, so that a cache never outlives the code that wrote it.
func binaryHash() (string, error) {
	selfHashOnce.Do(func() {
		exe, err := os.Executable()
		if err != nil {
			selfHashErr = err
			return
		}
		f, err := os.Open(exe)
		if err != nil {
			selfHashErr = err
			return
		}
		defer f.Close()
		h := sha256.New()
		if _, err := io.Copy(h, f); err != nil {
			selfHashErr = err
			return
		}
		selfHash = hex.EncodeToString(h.Sum(nil))
	})
	return selfHash, selfHashErr
}

// manifestPath is where the manifest for an output folder lives.
func manifestPath(root, out string) string {
	sum := sha256.Sum256([]byte(out))
	return filepath.Join(root, CacheDir, fmt.Sprintf("build-v%d-%s.json", cacheFormat, hex.EncodeToString(sum[:8])))
}

// upToDate returns the manifest of the last build into out when nothing
// it read has changed and its output is as it left it.
func upToDate(root, out, fp string) (*manifest, bool) {
	b, err := os.ReadFile(manifestPath(root, out))
	if err != nil {
		return nil, false
	}
	var m manifest
	if json.Unmarshal(b, &m) != nil || m.Format != cacheFormat || m.Fingerprint != fp {
		return nil, false
	}
	seen := 0
	ok := true
	err = filepath.WalkDir(out, func(p string, d fs.DirEntry, err error) error {
		if err != nil || !ok {
			return err
		}
		if d.IsDir() {
			return nil
		}
		rel, _ := filepath.Rel(out, p)
		want, listed := m.Files[filepath.ToSlash(rel)]
		info, ierr := d.Info()
		if !listed || ierr != nil || info.Size() != want.Size || info.ModTime().UnixNano() != want.ModTime {
			ok = false
			return nil
		}
		seen++
		return nil
	})
	if err != nil || !ok || seen != len(m.Files) {
		return nil, false
	}
	return &m, true
}

// remember writes the manifest of a finished build. A cache that cannot
// be written only costs the next build its shortcut.
func remember(root, out, fp string, pages int, problems []Problem, tally Tally) {
	m := manifest{Format: cacheFormat, Fingerprint: fp, Pages: pages, Problems: problems, Tally: tally, Files: map[string]outputFile{}}
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
	b, err := json.Marshal(m)
	if err != nil {
		return
	}
	dir := filepath.Join(root, CacheDir)
	if err := os.MkdirAll(dir, 0o755); err != nil {
		return
	}
	_ = os.WriteFile(filepath.Join(dir, "README"), []byte("specgen's build cache: safe to delete.\n"), 0o644)
	tmp := manifestPath(root, out) + ".tmp"
	if os.WriteFile(tmp, b, 0o644) == nil {
		_ = os.Rename(tmp, manifestPath(root, out))
	}
}
