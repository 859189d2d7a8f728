// Command rates regenerates the verdict procedure's simulated tables:
//
//	go run ./breaks/decide/cmd/rates -what union   # union_table.go: null quantiles of the unit-root union
//	go run ./breaks/decide/cmd/rates -what rates   # rates_table.go and doc/confusion.md: error rates
//
// Both are seeded and reproducible; run from the repository root.
package main
