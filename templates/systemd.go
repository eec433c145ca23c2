package templates

import (
	"embed"
	"io/fs"
)

//go:embed systemd
var systemd embed.FS

// Systemd returns the service files, rooted at the folder systemd/:
// plumbline.service, a unit running `plumbline serve` as a dedicated user.
func Systemd() fs.FS {
	sub, err := fs.Sub(systemd, "systemd")
	if err != nil {
		panic(err) // cannot happen: "systemd" is a valid embedded path
	}
	return sub
}

// SystemdUnit returns the bytes of plumbline.service.
func SystemdUnit() []byte {
	b, err := fs.ReadFile(systemd, "systemd/plumbline.service")
	if err != nil {
		panic(err) // cannot happen: the file is embedded
	}
	return b
}
