package templates

import _ "embed"

// defaultConfig is the commented configuration file written by
// `plumbline init`.
//
//go:embed plumbline.toml
var defaultConfig []byte

// DefaultConfig returns the commented default configuration file,
// plumbline.toml: every key with the value used when it is left out, the
// optional tables as examples switched off, and a starting set of limits.
// The slice is a copy.
func DefaultConfig() []byte {
	return append([]byte(nil), defaultConfig...)
}
