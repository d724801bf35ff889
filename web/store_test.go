package web_test

import (
	"meltbook/store"
	"meltbook/web"
)

// The server serves a store as it is.
var _ web.Notebook = (*store.Store)(nil)
