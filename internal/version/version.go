// Package version tells which specgen is running: the release tag it was
// built from, or the commit of the source it was built from.
package version

import "runtime/debug"

// tag is the release version, set by the release build with
// -ldflags "-X <module>/internal/version.tag=v1.2.3".
var tag string

// String is the release tag given at link time; else the module version
// that "go install module@version" records; else the commit the binary was
// built from, with "+dirty" when the working tree had changes; else
// "devel".
func String() string {
	if tag != "" {
		return tag
	}
	info, ok := debug.ReadBuildInfo()
	if !ok {
		return "devel"
	}
	return fromBuildInfo(info)
}

// fromBuildInfo reads the version from what the go command records in the
// binary.
func fromBuildInfo(info *debug.BuildInfo) string {
	if v := info.Main.Version; v != "" && v != "(devel)" {
		return v
	}
	rev, dirty := "", false
	for _, s := range info.Settings {
		switch s.Key {
		case "vcs.revision":
			rev = s.Value
		case "vcs.modified":
			dirty = s.Value == "true"
		}
	}
	if rev == "" {
		return "devel"
	}
	if len(rev) > 12 {
		rev = rev[:12]
	}
	if dirty {
		rev += "+dirty"
	}
	return "devel " + rev
}

// Generator is how specgen names itself in what it writes: the generator
// meta tag of every page and results.json.
func Generator() string { return "specgen " + String() }
