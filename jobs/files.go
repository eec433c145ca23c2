package jobs

import (
	"crypto/sha256"
	"encoding/hex"
	"os"
	"path/filepath"
)

// SHA256Hex is the lower-case hex sha256 of b, the form every checksum
// is stored and printed in.
func SHA256Hex(b []byte) string {
	s := sha256.Sum256(b)
	return hex.EncodeToString(s[:])
}

// WriteFile writes data to name atomically; see writeFileAtomic.
func WriteFile(name string, data []byte, perm os.FileMode) error {
	return writeFileAtomic(name, data, perm)
}

// writeFileAtomic writes data to a hidden temporary file beside name,
// syncs it and renames it over name, so a reader sees the whole file or
// none of it.
func writeFileAtomic(name string, data []byte, perm os.FileMode) error {
	dir, base := filepath.Split(name)
	tmp, err := os.CreateTemp(dir, "."+base+".tmp-*")
	if err != nil {
		return err
	}
	defer os.Remove(tmp.Name()) // no-op after the rename
	if _, err := tmp.Write(data); err != nil {
		tmp.Close()
		return err
	}
	if err := tmp.Chmod(perm); err != nil {
		tmp.Close()
		return err
	}
	if err := tmp.Sync(); err != nil {
		tmp.Close()
		return err
	}
	if err := tmp.Close(); err != nil {
		return err
	}
	return os.Rename(tmp.Name(), name)
}
