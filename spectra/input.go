package spectra

import (
	"crypto/sha256"
	"encoding/hex"
	"sync"
)

// Input identifies one file a spectrum was read from: its name as given to
// [Decode] and the SHA-256 of its bytes in lower-case hex, so that a reader
// of the figures can tell whether they hold the same file.
type Input struct {
	Name   string `json:"name"`
	SHA256 string `json:"sha256"`
}

// inputOf returns the Input for data read under name.
func inputOf(name string, data []byte) Input {
	sum := sha256.Sum256(data)
	return Input{Name: name, SHA256: hex.EncodeToString(sum[:])}
}

var (
	g173SumOnce sync.Once
	g173Sum     string
)

// SolarTableSHA256 returns the SHA-256 (lower-case hex) of the embedded
// ASTM G173-03 table, so that reports can name the exact copy they used.
func SolarTableSHA256() string {
	g173SumOnce.Do(func() { g173Sum = inputOf("", []byte(g173CSV)).SHA256 })
	return g173Sum
}
