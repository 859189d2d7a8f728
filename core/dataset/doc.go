// Package dataset reads the analyst's data: delimited text (CSV, TSV,
// semicolon-separated, cells pasted from a spreadsheet), .xlsx workbooks, and
// the two streaming batch formats (long id/date/value files and JSON Lines).
// It is pure Go: the parsing code takes []byte or io.Reader and is shared by
// the command-line tool, the batch mode and the WebAssembly page; only
// ReadFile touches the file system.
//
// # Delimited text
//
// Parse detects the delimiter (tab, ';', ',' or '|': the first, in that order,
// whose count is the same on every sampled line, else the one most frequent in
// the header; a single column is read as tab-separated so that "1,5" stays one
// cell), a UTF-8 byte-order mark, LF, CRLF and CR line ends and
// double-quoted fields ("" inside quotes is one quote). A header row is
// required. Blank lines are skipped. Spaces around unquoted fields are ignored.
//
// Numbers: with ',' as delimiter the decimal mark is '.', and ',' may group
// thousands ("1,234.5" quoted). With ';' or tab the decimal mark is detected
// from the whole file: cells such as "1,5" or "1.234,5" vote for a decimal
// comma, cells such as "1.5" or "1,234.5" for a decimal point. A file without
// evidence uses the comma with ';' and the point with tab, and a warning names
// the ambiguity when a cell such as "1,234" could be read either way. Thousands
// groups (',' '.' space, no-break space, apostrophe) are accepted only when
// every group after the first has exactly three digits. Hexadecimal, "Inf" and
// values that overflow float64 are rejected.
//
// Missing values: a cell that is empty or, after trimming spaces and ignoring
// case, equal to one of NA, N/A, NaN, ".", "#N/A", null, "-" is missing and is
// stored as NaN. The list is MissingMarkers.
//
// # Dates
//
// Accepted date cells (Y = 4-digit year):
//
//	annual     1990
//	quarterly  2009Q1 2009q1 2009-Q1 2009 Q1 2009.Q1 Q1 2009 Q1-2009, and 2009:1 when the column's
//	           sub-periods are all 1..4
//	monthly    2009-03 2009-3 2009M03 2009m3 2009/03 03/2009 Mar 2009 March 2009 Mar-2009,
//	           and 2009:03 when some sub-period exceeds 4
//	daily      2009-03-17 2009/03/17 17.03.2009 Jan 1 2000 January 1, 2000 1 Jan 2000 17-Mar-2009,
//	           optionally followed by a midnight time (T00:00:00Z, " 00:00")
//
// The date column is Options.DateColumn, else the first column named like a
// date (date, time, period, month, year, quarter, week, day, obs,
// observation_date ...) whose cells are all dates, else the first column whose
// cells are all dates of a non-annual form. Plain 4-digit integers are read as
// years only in a date-named column or in the first column when they increase
// by one. Daily dates that all fall on the same day of the month (or all on
// month ends) are months (or quarters or years, from their spacing): "Jan 1
// 2000" is the monthly label "2000-01". Frequency is detected from the spacing:
// annual, quarterly, monthly, weekly (every 7 days), daily (every calendar day,
// or business days: weekdays only, steps of 1 to 5 days) or irregular (a
// warning names the first gap). Labels are canonical per frequency: "2009",
// "2009Q1", "2009-03", "2009-03-17". Dates must increase; the error names the
// row.
//
// # Errors
//
// Errors carrying a position are *ParseError (file, 1-based line in the file,
// 1-based column, column name) and wrap one of the sentinels ErrNoHeader,
// ErrNoSeries, ErrBadNumber, ErrBadDate, ErrDateOrder, ErrUnknownColumn,
// ErrNotContiguous; Select reports *SeriesError wrapping ErrInteriorMissing,
// ErrTooShort, ErrNonPositive, ErrBadRange or ErrBadTransform. Test with
// errors.Is and errors.As.
package dataset
