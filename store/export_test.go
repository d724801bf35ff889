package store

import (
	"context"
	"io/fs"
)

// InitWith and OpenWith let tests use their own migration files.
func InitWith(ctx context.Context, path string, opt Options, mfs fs.FS) (*Store, error) {
	return initNotebook(ctx, path, opt, mfs)
}

func OpenWith(ctx context.Context, path string, opt Options, mfs fs.FS) (*Store, error) {
	return open(ctx, path, opt, mfs)
}
