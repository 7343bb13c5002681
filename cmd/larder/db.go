package main

import (
	"context"
	"log/slog"
	"os"

	"larder/internal/pgcluster"
)

// openDatabase returns the DSN to use: DATABASE_URL when set, and nothing
// else; otherwise a private cluster in dataDir, stopped again by cleanup.
func openDatabase(ctx context.Context, dataDir string, log *slog.Logger) (dsn string, cleanup func(), err error) {
	if u := os.Getenv("DATABASE_URL"); u != "" {
		return u, func() {}, nil
	}
	if dataDir == "" {
		dataDir = defaultDataDir()
	}
	c, err := pgcluster.Start(ctx, pgcluster.Options{DataDir: dataDir, Logger: log})
	if err != nil {
		return "", nil, err
	}
	log.Info("using private PostgreSQL cluster", "data_dir", c.Dir())
	return c.DSN("larder"), func() {
		if err := c.Stop(); err != nil {
			log.Error("stopping PostgreSQL", "err", err)
		}
	}, nil
}

// defaultDataDir honours LARDER_DATA_DIR, else a per-user folder.
func defaultDataDir() string {
	if d := os.Getenv("LARDER_DATA_DIR"); d != "" {
		return d
	}
	return pgcluster.DefaultDataDir()
}
