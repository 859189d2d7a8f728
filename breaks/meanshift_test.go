package breaks

import (
	"strings"

	"github.com/rootshift/rootshift/core"
)

// msCase resolves a test case named by a table key of the meanshift test
// ("meanshift/additive-2": the outlier type and the number of shifts) into
// the registered id and the settings that select that model; any other id
// passes through with cfg unchanged.
func msCase(id string, cfg *core.Config) (string, *core.Config) {
	rest, ok := strings.CutPrefix(id, "meanshift/")
	if !ok {
		return id, cfg
	}
	if cfg == nil {
		cfg = &core.Config{}
	}
	form, n, _ := strings.Cut(rest, "-")
	cfg.Outlier, _ = core.ParseOutlier(form)
	cfg.Shifts = 1
	if n == "2" {
		cfg.Shifts = 2
	}
	return "meanshift", cfg
}
