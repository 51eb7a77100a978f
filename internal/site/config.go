package site

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/BurntSushi/toml"

	"specgen/internal/calc"
)

// ConfigFile is the optional site configuration at the site root.
const ConfigFile = "specgen.toml"

// Config is the site configuration.
type Config struct {
	Title       string         `toml:"title"`
	Description string         `toml:"description"`
	SigFigs     int            `toml:"sig_figs"`
	Markdown    MarkdownConfig `toml:"markdown"`
}

// MarkdownConfig holds the Markdown settings.
type MarkdownConfig struct {
	// RawHTML lets raw HTML in pages through instead of showing it escaped.
	RawHTML bool `toml:"raw_html"`
}

var configKeys = []string{"description", "markdown", "markdown.raw_html", "sig_figs", "title"}

// DefaultConfig is the configuration of a site without specgen.toml.
func DefaultConfig() Config {
	return Config{Title: "Build documentation", SigFigs: 3}
}

// LoadConfig reads root/specgen.toml if it exists.
func LoadConfig(root string) (Config, error) {
	cfg := DefaultConfig()
	src, err := os.ReadFile(filepath.Join(root, ConfigFile))
	if errors.Is(err, fs.ErrNotExist) {
		return cfg, nil
	}
	if err != nil {
		return cfg, err
	}
	text := string(src)
	md, err := toml.Decode(text, &cfg)
	if err != nil {
		return cfg, tomlError(ConfigFile, 0, text, err, "site configuration")
	}
	lines := calc.KeyLines(text)
	var errs ErrorList
	for _, k := range md.Undecoded() {
		key := k.String()
		msg := fmt.Sprintf("unknown key %q; allowed: %s", key, strings.Join(configKeys, ", "))
		if s := calc.Suggest(key, configKeys); s != "" {
			msg = fmt.Sprintf("unknown key %q; did you mean %q? (allowed: %s)", key, s, strings.Join(configKeys, ", "))
		}
		errs = append(errs, &Error{File: ConfigFile, Line: lines[key], Msg: msg})
	}
	if cfg.SigFigs < 2 || cfg.SigFigs > 8 {
		errs = append(errs, &Error{File: ConfigFile, Line: lines["sig_figs"],
			Msg: fmt.Sprintf("sig_figs: %d is out of range; allowed: 2 to 8 significant figures", cfg.SigFigs)})
	}
	if strings.TrimSpace(cfg.Title) == "" {
		errs = append(errs, &Error{File: ConfigFile, Line: lines["title"], Msg: "title: must not be empty"})
	}
	sort.SliceStable(errs, func(i, j int) bool { return errs[i].Line < errs[j].Line })
	if len(errs) > 0 {
		return cfg, errs
	}
	return cfg, nil
}
