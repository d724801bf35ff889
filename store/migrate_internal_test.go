package store

import (
	"context"
	"database/sql"
	"path/filepath"
	"testing"
)

// Every migration switches foreign-key enforcement off on the connection
// it runs on; afterwards each connection in the pool enforces it again.
func TestMigrationsLeaveForeignKeysEnforced(t *testing.T) {
	ctx := context.Background()
	s, err := Init(ctx, filepath.Join(t.TempDir(), "notebook.db"), Options{})
	if err != nil {
		t.Fatal(err)
	}
	defer s.Close()
	// The pool keeps at most two idle connections (database/sql's
	// default), so four held at once include every one a migration used.
	var conns []*sql.Conn
	for range 4 {
		c, err := s.db.Conn(ctx)
		if err != nil {
			t.Fatal(err)
		}
		conns = append(conns, c)
	}
	for i, c := range conns {
		var on int
		if err := c.QueryRowContext(ctx, "PRAGMA foreign_keys").Scan(&on); err != nil {
			t.Fatal(err)
		}
		if on != 1 {
			t.Errorf("connection %d: foreign_keys = %d after the migrations; want 1", i, on)
		}
		c.Close()
	}
}
