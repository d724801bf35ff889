package web_test

import (
	"meltbook/store"
	"meltbook/web"
)

// The store already has the methods of web.StoreMethods, with the same
// signatures; the rest of web.Notebook is for an adapter.
var _ web.StoreMethods = (*store.Store)(nil)
