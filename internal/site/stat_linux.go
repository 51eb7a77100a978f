package site

import (
	"io/fs"
	"syscall"
)

// inodeAndChangeTime are a file's inode and the time its contents or
// status last changed, in nanoseconds.
func inodeAndChangeTime(info fs.FileInfo) (uint64, int64) {
	st, ok := info.Sys().(*syscall.Stat_t)
	if !ok {
		return 0, 0
	}
	return st.Ino, st.Ctim.Nano()
}
