package main

import (
	"fmt"
	"io"
	"runtime/debug"
)

// toolVersion names the build: the module version when the binary was
// installed from a tagged module, otherwise "devel" with the VCS revision
// the build information carries (and "+modified" for a build from a tree
// with uncommitted changes). Reports and the --version flag print it.
func toolVersion() string {
	info, ok := debug.ReadBuildInfo()
	if !ok {
		return "devel (no build information)"
	}
	return versionOf(info)
}

// versionOf is toolVersion for given build information.
func versionOf(info *debug.BuildInfo) string {
	if v := info.Main.Version; v != "" && v != "(devel)" {
		return v
	}
	var rev, modified string
	for _, s := range info.Settings {
		switch s.Key {
		case "vcs.revision":
			rev = s.Value
		case "vcs.modified":
			if s.Value == "true" {
				modified = "+modified"
			}
		}
	}
	if rev == "" {
		return "devel (no VCS revision in the build information)"
	}
	if len(rev) > 12 {
		rev = rev[:12]
	}
	return "devel " + rev + modified
}

// printVersion is "tripgrade --version".
func printVersion(w io.Writer) int {
	fmt.Fprintf(w, "tripgrade %s\n", toolVersion())
	return exitOK
}
