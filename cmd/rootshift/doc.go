// Command rootshift tests whether time series have a unit root, or only look
// like it because of structural breaks, and recommends what to do with each.
//
// Usage:
//
//	rootshift test [options] FILE...     test the series in CSV/TSV/.xlsx files
//	rootshift demo [options]             run the battery on the built-in (invented) demo data
//	rootshift batch [options] INPUT...   many series: JSON Lines out, parallel, resumable, shardable
//	rootshift critical --test ID --n T   simulated finite-sample critical values
//	rootshift page -o FILE               write the offline page (one self-contained HTML file)
//	rootshift tests                      list the test ids
//	rootshift version                    print the version
//
// Exit status: 0 on success, 1 when some series failed (each failure is
// recorded in that series' errors), 2 for usage errors or unreadable input.
package main
