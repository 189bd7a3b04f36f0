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

// FileID returns the device and inode of fi, and false where the file
// system gives none.
func FileID(fi fs.FileInfo) (dev, ino uint64, ok bool) {
	st, ok := fi.Sys().(*syscall.Stat_t)
	if !ok {
		return 0, 0, false
	}
	return uint64(st.Dev), uint64(st.Ino), true
}
