package site

import (
	"errors"
	"fmt"
	"io/fs"
	"maps"
	"math"
	"net/url"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"sort"
	"strconv"
	"strings"

	"github.com/BurntSushi/toml"

	"github.com/millrace-workshop/specgen/internal/calc"
	"github.com/millrace-workshop/specgen/internal/inputerr"
	"github.com/millrace-workshop/specgen/internal/models"
)

// ConfigFile is the optional site configuration at the site root.
const ConfigFile = "specgen.toml"

// Config is the site configuration.
type Config struct {
	Title       string `toml:"title"`
	Description string `toml:"description"`
	SigFigs     int    `toml:"sig_figs"`
	// BaseURL is the address the site is published at, ending in "/"
	// ("https://example.org/docs/"); "" when not given. With it the build
	// writes sitemap.xml and canonical links, and the 404 page's links
	// work at any depth.
	BaseURL  string         `toml:"base_url"`
	Markdown MarkdownConfig `toml:"markdown"`
	Safety   SafetyConfig   `toml:"safety"`
	// Materials adds materials or overrides properties of built-in ones.
	Materials map[string]models.MaterialRow `toml:"materials"`
	// env is the calculation environment the settings make.
	env *models.Env
	// catalog is the models and rules, with env.
	catalog *calc.Catalog
}

// SafetyConfig holds the site's minimum safety factors. MinimumFactor, when
// set, applies to every material; the other two set one class each.
type SafetyConfig struct {
	MinimumFactor        float64 `toml:"minimum_factor"`
	MinimumFactorMetal   float64 `toml:"minimum_factor_metal"`
	MinimumFactorPlastic float64 `toml:"minimum_factor_plastic"`
	// MinimumFactorBuckling is on the collapse pressure of walls under
	// outside pressure; minimum_factor leaves it alone.
	MinimumFactorBuckling float64 `toml:"minimum_factor_buckling"`
}

// MarkdownConfig holds the Markdown settings.
type MarkdownConfig struct {
	// RawHTML lets raw HTML in pages through instead of showing it escaped.
	RawHTML bool `toml:"raw_html"`
}

var configKeys = []string{"base_url", "description", "markdown", "markdown.raw_html", "materials", "safety", "safety.minimum_factor",
	"safety.minimum_factor_buckling", "safety.minimum_factor_metal", "safety.minimum_factor_plastic", "sig_figs", "title"}

// materialName is what a material added in specgen.toml may be called.
var materialName = regexp.MustCompile(`^[a-z0-9][a-z0-9._-]*$`)

// defaultCatalog is the models and rules with the built-in materials; a
// failure is the build's own fault and shows in every test.
var defaultCatalog, defaultCatalogErr = models.NewCatalog(nil)

// DefaultConfig is the configuration of a site without specgen.toml.
func DefaultConfig() Config {
	return Config{Title: "Build documentation", SigFigs: 3, env: models.DefaultEnv(), catalog: defaultCatalog}
}

// makeEnv builds the calculation environment: built-in materials with the
// site's additions, and the minimum safety factors.
func (cfg *Config) makeEnv(lines map[string]int) (*models.Env, inputerr.List) {
	var errs inputerr.List
	env := models.DefaultEnv()
	safety := models.DefaultSafety
	for _, f := range []struct {
		key   string
		value float64
		dst   []*float64
	}{
		// The general figure first, so that a specific one given beside it wins.
		{"minimum_factor", cfg.Safety.MinimumFactor, []*float64{&safety.MinimumFactorMetal, &safety.MinimumFactorBrittle}},
		{"minimum_factor_metal", cfg.Safety.MinimumFactorMetal, []*float64{&safety.MinimumFactorMetal}},
		{"minimum_factor_plastic", cfg.Safety.MinimumFactorPlastic, []*float64{&safety.MinimumFactorBrittle}},
		{"minimum_factor_buckling", cfg.Safety.MinimumFactorBuckling, []*float64{&safety.MinimumFactorBuckling}},
	} {
		key := "safety." + f.key
		if _, set := lines[key]; !set {
			continue
		}
		if !(f.value >= 1 && f.value <= 100) { // NaN too
			errs = append(errs, &inputerr.Error{File: ConfigFile, Line: lines[key],
				Msg: fmt.Sprintf("%s: %s is out of range; allowed: 1 to 100 (a factor below 1 accepts failure)", key, numberWords(f.value))})
			continue
		}
		for _, d := range f.dst {
			*d = f.value
		}
	}
	env.Safety = safety
	badName := false
	for _, name := range slices.Sorted(maps.Keys(cfg.Materials)) {
		if !materialName.MatchString(name) {
			badName = true
			errs = append(errs, &inputerr.Error{File: ConfigFile, Line: lines["materials."+name],
				Msg: fmt.Sprintf("materials: %q is not allowed as a material name; a name is lower-case letters, digits, '-', '_' and '.', starting with a letter or digit (put free text in label)", name)})
		}
	}
	if len(cfg.Materials) > 0 && !badName {
		base, err := models.DefaultMaterials()
		if err != nil {
			return env, append(errs, &inputerr.Error{Msg: err.Error()})
		}
		mats, err := base.With(cfg.Materials, lines, ConfigFile)
		if err != nil {
			return env, append(errs, inputerr.From(err)...)
		}
		env.Materials = mats
	}
	return env, errs
}

// LoadConfig reads root/specgen.toml if it exists.
func LoadConfig(root string) (Config, error) {
	cfg := DefaultConfig()
	if defaultCatalogErr != nil {
		return cfg, defaultCatalogErr
	}
	src, err := os.ReadFile(filepath.Join(root, ConfigFile))
	if errors.Is(err, fs.ErrNotExist) {
		return cfg, nil
	}
	if err != nil {
		if info, statErr := os.Stat(filepath.Join(root, ConfigFile)); statErr == nil && info.IsDir() {
			return cfg, &inputerr.Error{File: ConfigFile, Msg: "is a folder; the site settings are a TOML file of that name (or leave it out for the defaults)"}
		}
		return cfg, err
	}
	text := string(src)
	md, err := toml.Decode(text, &cfg)
	if err != nil {
		// The pages are still read, with the default settings.
		return DefaultConfig(), tomlError(ConfigFile, 0, text, err, "site configuration")
	}
	lines := calc.KeyLines(text)
	var errs inputerr.List
	// A plain value for materials decodes as no materials at all. (A table
	// made by [materials.x] alone has no type of its own.)
	if t := md.Type("materials"); t != "" && t != "Hash" {
		errs = append(errs, &inputerr.Error{File: ConfigFile, Line: lines["materials"],
			Msg: fmt.Sprintf("materials: %s is not allowed here; write a table per material: a line [materials.NAME] and its keys below it", tomlKindWord(t))})
	}
	for _, k := range md.Undecoded() {
		key := k.String()
		msg := fmt.Sprintf("unknown key %q; allowed: %s", key, strings.Join(configKeys, ", "))
		// The table a key is in is no typo of the key: "markdown.nope" is
		// not "markdown".
		candidates := slices.DeleteFunc(slices.Clone(configKeys), func(c string) bool { return strings.HasPrefix(key, c+".") })
		if s := calc.Suggest(key, candidates); s != "" {
			msg = fmt.Sprintf("unknown key %q; did you mean %q? (allowed: %s)", key, s, strings.Join(configKeys, ", "))
		}
		errs = append(errs, &inputerr.Error{File: ConfigFile, Line: lines[key], Msg: msg})
	}
	if cfg.SigFigs < 2 || cfg.SigFigs > 8 {
		errs = append(errs, &inputerr.Error{File: ConfigFile, Line: lines["sig_figs"],
			Msg: fmt.Sprintf("sig_figs: %d is out of range; allowed: 2 to 8 significant figures", cfg.SigFigs)})
		cfg.SigFigs = DefaultConfig().SigFigs
	}
	if strings.TrimSpace(cfg.Title) == "" {
		errs = append(errs, &inputerr.Error{File: ConfigFile, Line: lines["title"], Msg: "title: must not be empty"})
	}
	if cfg.BaseURL != "" {
		base, err := checkBaseURL(cfg.BaseURL)
		if err != nil {
			errs = append(errs, &inputerr.Error{File: ConfigFile, Line: lines["base_url"], Key: "base_url", Msg: err.Error()})
		}
		cfg.BaseURL = base
	}
	env, envErrs := cfg.makeEnv(lines)
	errs = append(errs, envErrs...)
	cfg.env = env
	cat, err := models.NewCatalog(env)
	if err != nil {
		errs = append(errs, &inputerr.Error{File: ConfigFile, Msg: err.Error()})
		// The pages are still read, with the built-in materials.
		cat, cfg.env = defaultCatalog, models.DefaultEnv()
	}
	cfg.catalog = cat
	sort.SliceStable(errs, func(i, j int) bool { return errs[i].Line < errs[j].Line })
	if len(errs) > 0 {
		return cfg, errs
	}
	return cfg, nil
}

// checkBaseURL returns the address a site is published at, ending in "/",
// or says why text is not one.
func checkBaseURL(text string) (string, error) {
	u, err := url.Parse(text)
	if err != nil || (u.Scheme != "http" && u.Scheme != "https") || u.Host == "" || u.User != nil ||
		u.RawQuery != "" || u.Fragment != "" || strings.ContainsAny(text, " \t\n") {
		return "", fmt.Errorf("%q is not allowed; write the full address the site is published at, starting with https:// or http://, without a query or #fragment, e.g. \"https://example.org/docs/\"", text)
	}
	if !strings.HasSuffix(u.Path, "/") {
		u.Path += "/"
	}
	return u.String(), nil
}

// numberWords writes a number for a message; NaN and infinities as the
// TOML words for them, never Go's.
func numberWords(v float64) string {
	switch {
	case math.IsNaN(v):
		return "nan (not a number)"
	case math.IsInf(v, 1):
		return "inf (infinite)"
	case math.IsInf(v, -1):
		return "-inf (infinite)"
	}
	return strconv.FormatFloat(v, 'g', -1, 64)
}

// tomlKindWord names a TOML value type (toml.MetaData.Type) in a writer's
// words.
func tomlKindWord(t string) string {
	switch t {
	case "Integer":
		return "a whole number"
	case "Float":
		return "a number"
	case "String":
		return "a quoted string"
	case "Bool":
		return "true or false"
	case "Array", "ArrayHash":
		return "a list"
	case "Datetime", "DatetimeLocal", "DateLocal", "TimeLocal":
		return "a date or time"
	}
	return "this value"
}
