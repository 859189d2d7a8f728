// Command confusion regenerates the verdict's confusion table: it simulates
// series from each process in battery.Families, runs the default battery and
// the verdict on each, and counts the classes. The table in the README and in
// doc/confusion.md is its output:
//
//	go run ./breaks/battery/cmd/confusion -draws 500 -o doc/confusion.md
package main
