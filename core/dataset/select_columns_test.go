package dataset

import (
	"errors"
	"fmt"
	"strings"
	"testing"

	"github.com/rootshift/rootshift/core/schema"
)

// TestUnknownColumnListsValid: a --columns name that the table does not
// have is an error that lists the valid names (issue 12, item 6), the first
// 30 and a count of the rest for a wide table (common practice, no source).
func TestUnknownColumnListsValid(t *testing.T) {
	tb := mustParse(t, "date,gdp,cpi\n2000-01-01,1,2\n2000-02-01,2,3\n2000-03-01,3,5\n")
	_, errs := Select(tb, schema.Settings{Columns: []string{"gpd"}})
	if len(errs) != 1 || !errors.Is(errs[0].Err, ErrUnknownColumn) {
		t.Fatalf("errors %v", errs)
	}
	if msg := errs[0].Error(); !strings.Contains(msg, `valid columns: "gdp", "cpi"`) {
		t.Errorf("message %q does not list the valid columns", msg)
	}

	var b strings.Builder
	b.WriteString("date")
	for i := 0; i < 35; i++ {
		fmt.Fprintf(&b, ",s%d", i)
	}
	b.WriteString("\n")
	for r := 0; r < 3; r++ {
		fmt.Fprintf(&b, "2000-0%d-01", r+1)
		for i := 0; i < 35; i++ {
			fmt.Fprintf(&b, ",%d", r+i)
		}
		b.WriteString("\n")
	}
	_, errs = Select(mustParse(t, b.String()), schema.Settings{Columns: []string{"nope"}})
	if len(errs) != 1 {
		t.Fatalf("errors %v", errs)
	}
	msg := errs[0].Error()
	if !strings.Contains(msg, `"s29" and 5 more`) || strings.Contains(msg, `"s30"`) {
		t.Errorf("wide table: message %q", msg)
	}
}
