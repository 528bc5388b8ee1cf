// Package migrations holds pathvet's SQL migrations, applied in order by
// goose; files are only ever appended.
package migrations

import "embed"

// FS holds the migration files.
//
//go:embed *.sql
var FS embed.FS
