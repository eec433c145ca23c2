package main

import "runtime/debug"

// programVersion is set at build time with -ldflags "-X main.programVersion=...";
// otherwise the module version recorded by the go command is used.
var programVersion = ""

func version() string {
	if programVersion != "" {
		return programVersion
	}
	if bi, ok := debug.ReadBuildInfo(); ok && bi.Main.Version != "" && bi.Main.Version != "(devel)" {
		return bi.Main.Version
	}
	return "0.1.0-dev"
}
