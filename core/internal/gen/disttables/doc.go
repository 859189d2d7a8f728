// Command disttables simulates rootshift's asymptotic null distributions of
// the Dickey-Fuller τ (no constant, constant, constant and trend), the
// Dickey-Fuller normalized bias n·ρ̂ (the limit of Phillips-Perron Z(α)) and
// the KPSS η_μ and η_τ statistics, and writes their quantiles at a fixed grid
// of probabilities to core/disttables_gen.go.
//
// τ and n·ρ̂ come from the Dickey-Fuller regression without lags on a
// driftless Gaussian random walk (Dickey & Fuller 1979); η from KPSS (1992)
// eq. (9) with lag truncation 0 on Gaussian white noise, both at length T
// (default 2000) as the large-T approximation of the limit. Replication r
// draws from rand.NewPCG(seed, r) (core.Simulate), so the output is identical
// whatever the number of workers.
//
// Usage (from core/): go run ./internal/gen/disttables -o disttables_gen.go
package main
