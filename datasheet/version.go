package datasheet

import "runtime/debug"

// Version returns the program's version from the build information: the
// module version when built from a released module, "devel-REVISION" (with
// "+dirty" for uncommitted changes) when built from a checkout, and "devel"
// when neither is known, as under "go test".
func Version() string {
	bi, ok := debug.ReadBuildInfo()
	if !ok {
		return "devel"
	}
	return versionOf(bi)
}

func versionOf(bi *debug.BuildInfo) string {
	if v := bi.Main.Version; v != "" && v != "(devel)" {
		return v
	}
	rev, dirty := "", false
	for _, s := range bi.Settings {
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
	return "devel-" + rev
}
