package meltbook

import (
	_ "github.com/go-chi/chi/v5"
	_ "github.com/schollz/progressbar/v3"
	_ "github.com/spf13/cobra"
	_ "gonum.org/v1/gonum/optimize"
	_ "modernc.org/sqlite"
)
