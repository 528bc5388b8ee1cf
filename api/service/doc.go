// Package service holds pathvet's service core: the submission, key,
// office, scope and filter types, the statuses and roles, and the error
// codes that storage returns and the API maps to HTTP statuses. It imports
// the standard library only, so that the API depends on these types and
// not on the database driver or the job queue (store implements the
// interface the API declares).
package service
