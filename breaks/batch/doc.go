// Package batch runs rootshift over many series on a server: many files or a
// directory, one wide file, a long file (id, date, value) or JSON Lines on
// standard input. Long files, JSON Lines and the selected columns
// (Settings.Columns) of a regular text file are streamed: memory is bounded
// by the number of series in flight, not by the input size. A wide file read
// for all its columns, a workbook or a wide file on standard input is read
// whole first (about five times its size). A bad series yields a record with its
// errors and the run goes on. Runs resume (series already in the output are
// skipped) and shard deterministically (a stable hash of the series id), so
// n array jobs on n machines together equal one full run, up to line order.
//
// # Output
//
// One JSON Lines record per series: a schema v2 document ("schema",
// "version", "settings", "source", "series", "caution") holding exactly one
// series — the same fields `rootshift test --json` writes, for one series.
// The series id used for sharding and in the side files is "SOURCE:NAME"
// where SOURCE is the file name as given (or the stream's name) and NAME the
// series name. Resuming matches series by key, the input's canonical path
// (absolute, links resolved) and NAME, and checks each input's content
// fingerprint (source.path and source.fingerprint in the records), so that
// the same directory named two ways is not run twice. source.index, the
// series' position among all series read, lets `batch merge` restore the
// input order of shard outputs and find missing series.
//
// Inputs that are not regular files (named pipes, sockets, devices), files
// that carry the schema marker of a rootshift document and the run's own
// outputs (Config.Exclude) are skipped with a note (Config.Note). Pool is the
// ordered worker pool shared with `rootshift test`; AnalyzeSeries adds the
// magnitude guard and the no-verdict rule to the battery's analysis.
package batch
