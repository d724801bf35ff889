// Package migrations holds the notebook's schema as numbered SQL files,
// applied in order by the store, each in its own transaction.
//
// A file is named NNN_topic.sql with NNN its version, counting up from 001
// without gaps. A migration that has landed is never edited: a change to the
// schema is a new file.
package migrations

import "embed"

// FS holds the migration files.
//
//go:embed *.sql
var FS embed.FS
