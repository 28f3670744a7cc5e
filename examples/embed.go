// Package examples holds the bundled example studies, embedded in the
// binary so that "tripgrade demo" needs no file:
//
//   - kestrel-park.toml: a 33/11 kV substation whose settings pass every
//     check;
//   - fenwick-quay.toml (with fenwick-quay-settings.csv): a smaller one
//     with deliberate setting mistakes, the one the README walks through.
//
// All names, places and figures in them are invented.
package examples

import "embed"

// FS holds the example studies and the files they refer to.
//
//go:embed *.toml *.csv
var FS embed.FS

// Demo is the study "tripgrade demo" checks by default.
const Demo = "fenwick-quay.toml"
