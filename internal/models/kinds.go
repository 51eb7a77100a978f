package models

import "github.com/millrace-workshop/specgen/internal/calc"

// kinds is every model specgen knows; a new kind is added here and in its
// own file.
var kinds = []*calc.Kind{
	&balanceKind,
	&boltsKind,
	&compressorKind,
	&driveKind,
	&figuresKind,
	&flywheelKind,
	&machineKind,
	&motorKind,
	&multistageKind,
	&plateKind,
	&tankKind,
	&tubeKind,
	&vacuumKind,
	&valveKind,
}

// NewCatalog returns every kind and caution rule, reading the site settings
// env (nil for the built-in materials and safety minimums).
func NewCatalog(env *Env) (*calc.Catalog, error) {
	if env == nil {
		if _, err := DefaultMaterials(); err != nil {
			return nil, err
		}
		env = DefaultEnv()
	}
	return calc.NewCatalog(kinds, rules, env)
}
