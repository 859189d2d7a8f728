// Command gendata writes simulated series as JSON Lines for batch
// benchmarks: half random walks, half stationary AR(1) (phi = 0.5), seeded.
// The data are simulated, not real.
//
//	go run ./breaks/batch/cmd/gendata -n 10000 -t 300 > series.jsonl
package main
