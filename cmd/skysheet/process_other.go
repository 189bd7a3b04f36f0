//go:build !unix

package main

// processAlive reports whether a process with the given id runs. Where that
// cannot be checked, every process counts as running, so that a lock is
// only ever broken by hand.
func processAlive(pid int) bool { return true }
