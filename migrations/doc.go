// Package migrations holds pathvet's SQL migrations for PostgreSQL,
// applied in order by goose; files are only ever appended.
package migrations
