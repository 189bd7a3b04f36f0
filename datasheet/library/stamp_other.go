//go:build !linux && !darwin

package library

import "io/fs"

// sysStamp gives no stamp where the change time is not known: every input
// is read again to be checked.
func sysStamp(fs.FileInfo) (Stamp, bool) { return Stamp{}, false }

// FileID gives no device and inode here.
func FileID(fs.FileInfo) (dev, ino uint64, ok bool) { return 0, 0, false }
