// Package dataset reads the analyst's data: delimited text (CSV, TSV,
// semicolon-separated, cells pasted from a spreadsheet), .xlsx workbooks, and
// the two streaming batch formats (long id/date/value files and JSON Lines).
// It is pure Go: the parsing code takes []byte or io.Reader and is shared by
// the command-line tool, the batch mode and the WebAssembly page; only
// ReadFile touches the file system.
//
// Whatever the reader decides or changes is reported as a Note in
// Table.Notes (and, for one column, in that Series' Notes); what it cannot
// read is an error naming the file, line and column. See NoteKinds.
//
// # Delimited text
//
// Parse detects the delimiter (tab, ';', ',' or '|': the first, in that order,
// whose count is the same on every sampled line, else the one most frequent in
// the header; a single column is read as tab-separated so that "1,5" stays one
// cell), a UTF-8 byte-order mark, LF, CRLF and CR line ends and
// double-quoted fields ("" inside quotes is one quote; a quote opens a quoted
// field only at the start of a field). A quoted field still open at the end of
// the file is an error (ErrQuote) naming the line where it opened; reading is
// linear in the file's size whatever the quoting. UTF-16 text with a
// byte-order mark is converted (noted); UTF-32 and UTF-16 without a
// byte-order mark are refused by name (ErrEncoding); other text that is not
// UTF-8 is read as Windows-1252 (noted).
//
// A header row is required; title lines above it (one text cell, no
// delimiter) are skipped with a note. When every data row has one cell more
// than the header and the first cells are 1..N or text, the first column is
// row names written without a header cell (noted). Empty header cells are named columnN, repeated
// names get the first free suffix _2, _3 ... (noted; no column is lost). A
// row with more non-empty cells than the header is an error (ErrExtraCells)
// naming the row: an unquoted "1,234.5" in a comma file would otherwise shift
// cells. Rows with fewer cells have missing values in the rest (noted). Blank
// rows before the header and after the data are ignored; blank rows inside the
// data are missing observations when the file has no date column, and are left
// out when it has one (the dates then show which periods are missing); either
// way they are noted. Spaces around unquoted fields are ignored.
//
// Numbers: with ',' as delimiter the decimal mark is '.', and ',' may group
// thousands ("1,234.5" quoted). With ';' or tab the decimal mark is detected
// from the whole file: cells such as "1,5" or "1.234,5" vote for a decimal
// comma, cells such as "1.5" or "1,234.5" for a decimal point. A file without
// evidence uses the comma with ';' and the point with tab, and a note names
// the ambiguity when a cell such as "1,234" could be read either way. Thousands
// groups (',' '.' space, no-break space, apostrophe) are accepted only when
// every group after the first has exactly three digits; a column with such
// cells is noted. Hexadecimal, "Inf" and values that overflow float64 are
// rejected.
//
// Missing values: a cell that is empty or, after trimming spaces and ignoring
// case, equal to one of NA, N/A, NaN, ".", "#N/A", null, "-" is missing and is
// stored as NaN. The list is MissingMarkers.
//
// # Streaming the selected columns
//
// ReadColumns reads delimited text row by row and keeps only some columns'
// values (with the date column and a few counts per column): the table is
// the one Parse returns for the whole file, restricted to those series, with
// the same notes and errors. The decisions that need the whole file take a
// sample (the delimiter, as Parse), a first pass that keeps counts (the
// decimal mark of ';' and tab files) or counts kept while reading (date,
// index and row-name columns); see ReadColumns.
//
// # Index columns
//
// The leading column is a row index, not a series (noted), when its header is
// empty and its cells are numbers (a spreadsheet export's index), or when it
// holds consecutive whole numbers starting at 0 or 1, or consecutive whole
// numbers under an index-like name (obs, index, id, n, no, row, t, period,
// time ...) or that were refused as years. Naming the column in
// Options.Columns tests it as a series.
//
// # Dates
//
// Accepted date cells (Y = 4-digit year, the list is AcceptedDateForms):
//
//	annual     1990
//	quarterly  2009Q1 2009q1 2009-Q1 2009 Q1 2009.Q1 Q1 2009 Q1-2009, and 2009:1 when the column's
//	           sub-periods are all 1..4
//	monthly    2009-03 2009-3 2009M03 2009m3 2009/03 03/2009 Mar 2009 March 2009 Mar-2009 2009-Mar
//	           Mar-09 (two-digit year), and 2009:03 when some sub-period exceeds 4
//	daily      2009-03-17 2009/03/17 17.03.2009 17/03/2009 03/17/2009 17-03-2009 Jan 1 2000
//	           January 1, 2000 1 Jan 2000 17-Mar-2009 2009-Mar-17, optionally followed by a
//	           midnight time (T00:00:00Z, " 00:00")
//	integers   200903 (year-month), 20091 (year-quarter), 20090317, in a column named like a
//	           date or with Options.DateFormat yyyymm, yyyyq or yyyymmdd
//
// Numeric dates with the year last are read day/month/year or
// month/day/year as the whole column decides: a cell with a first number above
// 12 means day/month/year, a second number above 12 month/day/year (a column
// with both is an error naming the row). When every cell reads both ways, dots
// mean day.month.year; otherwise the order that gives regular dates (monthly,
// quarterly ...) is taken when only one does, and else the read fails with
// ErrAmbiguousDate asking for Options.DateFormat ("dmy" or "mdy"). The
// decision is noted. Two-digit years after a month name take the century that
// puts the first year in 1969-2068 (1900s when the column would then end after
// 2068) and move on a century when the digits fall.
//
// The date column is Options.DateColumn, else the first column named like a
// date (date, time, period, month, year, quarter, week, day, obs,
// observation_date ...) whose cells are all dates, else the first column whose
// cells are all dates of a non-annual form. A column where most cells are
// dates but one is not (or is of another kind: one daily date among monthly
// ones) is an error naming that cell's row and listing the accepted forms.
//
// Years: whole numbers are read as years without an explicit date column only
// when all lie in 1800-2200 and the column is named like a date, or is the
// first column and counts up by one; otherwise they are noted as not read as
// years. An explicit DateColumn reads any years 1000-2999.
//
// Daily dates that all fall on the same day of the month (or all on month
// ends) are periods: months, or quarters or years when every step is a
// multiple of three or twelve months ("Jan 1 2000" is the monthly label
// "2000-01"; the reduction is noted unless the day is the 1st). Frequency is
// detected from the spacing: annual, quarterly, monthly, weekly (steps that
// are multiples of 7 days), daily (every calendar day, or business days:
// weekdays only, steps of 1 to 5 days) or irregular (noted with the first
// gap). Labels are canonical per frequency: "2009", "2009Q1", "2009-03",
// "2009-03-17". Dates must increase; the error names the row.
//
// # Calendar gaps
//
// Annual, quarterly, monthly and weekly dates may skip periods: the frequency
// stays, the gaps are noted, and Select handles them per series (within the
// series' own sample, after leading and trailing missing values are left
// out) by the gaps setting: stop (default) fails the series with ErrGap
// naming the missing periods; keep tests the observations as they are, one
// after the other, as if adjacent (no values are inserted; noted); split tests
// the longest stretch without gaps (the latest of equally long ones; noted).
//
// # Workbooks
//
// ReadXLSX reads Options.Sheet, else the first sheet that reads as a table;
// every other sheet with data is noted. Title rows above the header (one
// filled cell above a row with several) are skipped and noted.
//
// # Long files and JSON Lines
//
// LongReader streams files whose rows of one id are contiguous and groups
// in memory files whose ids interleave in the first MiB; rows of one id out
// of date order are sorted by date. Both are noted. A failed record's error
// carries its id (ParseError.ID).
//
// # Errors
//
// Errors carrying a position are *ParseError (file, 1-based line in the file,
// 1-based column, column name, record id) and wrap one of the sentinels
// ErrNoHeader, ErrNoSeries, ErrBadNumber, ErrBadDate, ErrAmbiguousDate,
// ErrDateOrder, ErrUnknownColumn, ErrNotContiguous, ErrExtraCells, ErrQuote,
// ErrEncoding; Select reports *SeriesError wrapping ErrInteriorMissing,
// ErrTooShort, ErrNonPositive, ErrBadRange, ErrBadTransform or ErrGap. Test
// with errors.Is and errors.As.
package dataset
