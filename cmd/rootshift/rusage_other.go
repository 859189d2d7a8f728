//go:build !linux && !darwin

package main

func peakMemoryMB() float64 { return 0 }
