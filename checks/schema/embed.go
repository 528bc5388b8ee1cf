package schema

import _ "embed"

// Package is the JSON Schema (draft 2020-12) of the submission package.
//
//go:embed package-v1.schema.json
var Package []byte

// Report is the JSON Schema (draft 2020-12) of the screening report.
//
//go:embed report-v1.schema.json
var Report []byte
