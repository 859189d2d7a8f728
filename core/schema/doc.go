// Package schema defines the versioned JSON document that every front end of
// rootshift writes: the CLI (`rootshift test --json`), the batch mode (one
// series per JSON Lines record) and the offline page (window.rootshift.analyze).
//
// The Go types here are the schema: a Document marshals to exactly the JSON
// described in schema/v2.json (embedded as SchemaJSON) and in doc/schema.md.
//
// # Conventions
//
//   - Field names are snake_case and form a contract: fields are only ever
//     added within v1, never renamed or removed.
//   - Break indexes count the series' observations from 1; TB is the last
//     observation of the old regime.
//   - Critical values are keyed by the significance level written as "0.01",
//     "0.05", "0.10" (and "0.025" where a table gives it).
//   - A number that could not be computed is null (a nil pointer), never NaN.
//
// Settings is both the JSON settings object and the Go settings struct the
// library entry points take; its zero value means the documented defaults.
package schema
