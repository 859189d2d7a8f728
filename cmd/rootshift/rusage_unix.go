//go:build linux || darwin

package main

import (
	"runtime"
	"syscall"
)

// peakMemoryMB is the process's peak resident set size in megabytes.
func peakMemoryMB() float64 {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	if runtime.GOOS == "darwin" {
		return float64(ru.Maxrss) / 1e6 // bytes
	}
	return float64(ru.Maxrss) / 1024 // kilobytes
}
