//go:build linux || darwin

package library

import (
	"io/fs"
	"syscall"
)

// sysStamp returns the stamp of fi, and false when the file system gives
// none.
func sysStamp(fi fs.FileInfo) (Stamp, bool) {
	st, ok := fi.Sys().(*syscall.Stat_t)
	if !ok {
		return Stamp{}, false
	}
	return Stamp{Dev: uint64(st.Dev), Ino: uint64(st.Ino), Size: st.Size, ModTime: fi.ModTime().UnixNano(), Change: changeTime(st)}, true
}
