package coord

import (
	"crypto/sha256"
	"encoding/hex"
)

// InputFile is a file a study was read from, with the SHA-256 of the
// bytes that were read, so that a report can prove which input it is
// about.
type InputFile struct {
	Name   string // as the user named it (or as the study refers to it)
	SHA256 string // lowercase hex
}

// NewInputFile records a file's name and the digest of its content.
func NewInputFile(name string, content []byte) InputFile {
	sum := sha256.Sum256(content)
	return InputFile{Name: name, SHA256: hex.EncodeToString(sum[:])}
}
