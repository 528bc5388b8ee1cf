// Package schema ships the JSON Schemas of pathvet's formats: the
// submission package and the screening report, format version 1. The
// formats are described in package-format.md and report-format.md beside
// the schemas, and the report's terms in glossary.md.
//
// Source: JSON Schema draft 2020-12 (json-schema.org).
package schema
