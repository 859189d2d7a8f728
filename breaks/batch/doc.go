// Package batch runs rootshift over many series on a server: many files or a
// directory, one wide file, a long file (id, date, value) or JSON Lines on
// standard input. It streams: memory is bounded by the number of series in
// flight, not by the input size. A bad series yields a record with its
// errors and the run goes on. Runs resume (series already in the output are
// skipped) and shard deterministically (a stable hash of the series id), so
// n array jobs on n machines together equal one full run, up to line order.
//
// # Output
//
// One JSON Lines record per series: a schema v1 document ("schema",
// "version", "settings", "source", "series", "caution") holding exactly one
// series — the same fields `rootshift test --json` writes, for one series.
// The series id used for resuming and sharding is "SOURCE:NAME" where SOURCE
// is the file name (or the stream's name) and NAME the series name.
package batch
