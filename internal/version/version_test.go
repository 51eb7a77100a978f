package version

import (
	"runtime/debug"
	"testing"
)

func TestFromBuildInfo(t *testing.T) {
	setting := func(kv ...string) []debug.BuildSetting {
		var out []debug.BuildSetting
		for i := 0; i < len(kv); i += 2 {
			out = append(out, debug.BuildSetting{Key: kv[i], Value: kv[i+1]})
		}
		return out
	}
	cases := []struct {
		name string
		info debug.BuildInfo
		want string
	}{
		{"go install module@v0.1.0", debug.BuildInfo{Main: debug.Module{Version: "v0.1.0"}}, "v0.1.0"},
		{"a pseudo-version", debug.BuildInfo{Main: debug.Module{Version: "v0.1.1-0.20261202175020-010530c9a1b2"}}, "v0.1.1-0.20261202175020-010530c9a1b2"},
		{"go build in a clean checkout", debug.BuildInfo{Main: debug.Module{Version: "(devel)"},
			Settings: setting("vcs.revision", "010530c9a1b2c3d4e5f6", "vcs.modified", "false")}, "devel 010530c9a1b2"},
		{"go build with changes", debug.BuildInfo{Main: debug.Module{Version: "(devel)"},
			Settings: setting("vcs.revision", "010530c9a1b2c3d4e5f6", "vcs.modified", "true")}, "devel 010530c9a1b2+dirty"},
		{"no version control", debug.BuildInfo{Main: debug.Module{Version: "(devel)"}}, "devel"},
	}
	for _, c := range cases {
		if got := fromBuildInfo(&c.info); got != c.want {
			t.Errorf("%s: %q, want %q", c.name, got, c.want)
		}
	}
}

// TestTagWins: a release build's -ldflags tag is what it reports.
func TestTagWins(t *testing.T) {
	defer func(old string) { tag = old }(tag)
	tag = "v9.8.7"
	if got := String(); got != "v9.8.7" {
		t.Errorf("String() = %q with the tag set", got)
	}
	if got := Generator(); got != "specgen v9.8.7" {
		t.Errorf("Generator() = %q", got)
	}
}
