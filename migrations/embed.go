// Package migrations holds the numbered SQL migrations of Larder's schema,
// embedded so the binary can bring any database up to date by itself.
package migrations

import "embed"

// FS holds every migration file (goose format: -- +goose Up / -- +goose Down).
//
//go:embed *.sql
var FS embed.FS
