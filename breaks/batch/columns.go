package batch

import (
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/rootshift/rootshift/core/dataset"
	"github.com/rootshift/rootshift/core/schema"
)

// Streamable reports whether the wide file at path is read by streaming,
// keeping only the selected columns (ReadSelected): columns are selected, the
// input is not a long table, and path is a regular file (it is read more
// than once) of delimited text (not standard input, not an .xlsx workbook).
func Streamable(path string, s schema.Settings) bool {
	if len(s.Columns) == 0 || s.Long != nil || path == "-" || strings.EqualFold(filepath.Ext(path), ".xlsx") {
		return false
	}
	st, err := os.Stat(path)
	return err == nil && st.Mode().IsRegular()
}

// ReadSelected reads the delimited text file at path (named name in
// messages) with dataset.ReadColumns, keeping the columns s.Columns: the
// table is the one dataset.Parse returns for the whole file, with only those
// series, and memory is that of the selected data, not of the file.
func ReadSelected(name, path string, s schema.Settings) (*dataset.Table, error) {
	open := func() (io.ReadCloser, error) { return os.Open(path) }
	return dataset.ReadColumns(name, open, dataset.OptionsFor(s), s.Columns)
}

// readHead returns the first n bytes of the file at path (fewer if it is
// shorter).
func readHead(path string, n int) ([]byte, error) {
	f, err := os.Open(path)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	b := make([]byte, n)
	k, err := io.ReadFull(f, b)
	if err == io.EOF || err == io.ErrUnexpectedEOF {
		err = nil
	}
	return b[:k], err
}
