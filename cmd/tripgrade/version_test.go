package main

import (
	"runtime/debug"
	"strings"
	"testing"
)

func TestVersionOf(t *testing.T) {
	cases := []struct {
		name string
		info debug.BuildInfo
		want string
	}{
		{"tagged module", debug.BuildInfo{Main: debug.Module{Version: "v1.2.3"}}, "v1.2.3"},
		{"devel with revision", debug.BuildInfo{Main: debug.Module{Version: "(devel)"}, Settings: []debug.BuildSetting{
			{Key: "vcs.revision", Value: "0123456789abcdef0123"}, {Key: "vcs.modified", Value: "false"}}}, "devel 0123456789ab"},
		{"devel modified", debug.BuildInfo{Main: debug.Module{Version: "(devel)"}, Settings: []debug.BuildSetting{
			{Key: "vcs.revision", Value: "abc"}, {Key: "vcs.modified", Value: "true"}}}, "devel abc+modified"},
		{"devel without vcs", debug.BuildInfo{Main: debug.Module{Version: "(devel)"}}, "devel (no VCS revision in the build information)"},
	}
	for _, c := range cases {
		if got := versionOf(&c.info); got != c.want {
			t.Errorf("%s: got %q, want %q", c.name, got, c.want)
		}
	}
}

func TestVersionFlag(t *testing.T) {
	for _, arg := range []string{"--version", "version"} {
		code, out, errOut := runArgs(arg)
		if code != exitOK || errOut != "" || !strings.HasPrefix(out, "tripgrade ") {
			t.Errorf("%s: exit %d, stdout %q, stderr %q", arg, code, out, errOut)
		}
	}
}
