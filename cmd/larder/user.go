package main

import (
	"bufio"
	"context"
	"errors"
	"flag"
	"fmt"
	"io"
	"net/mail"
	"os"
	"strings"
	"text/tabwriter"

	"larder/internal/auth"
	"larder/internal/store"
)

// runUser manages staff accounts from the command line: `user add` makes
// one (the first admin, typically), `user list` shows them.
func runUser(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		fmt.Fprintln(stderr, "usage: larder user add --email E --name N [--admin] [--password P | --password-stdin]\n       larder user list")
		return 2
	}
	switch args[0] {
	case "add":
		return userAdd(ctx, args[1:], os.Stdin, stdout, stderr)
	case "list":
		return userList(ctx, args[1:], stdout, stderr)
	}
	fmt.Fprintf(stderr, "larder user: unknown command %q (add, list)\n", args[0])
	return 2
}

func userAdd(ctx context.Context, args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("user add", flag.ContinueOnError)
	fs.SetOutput(stderr)
	dataDir := fs.String("data-dir", defaultDataDir(), "folder of the private PostgreSQL cluster when DATABASE_URL is not set (env LARDER_DATA_DIR)")
	email := fs.String("email", "", "email the user signs in with (required)")
	name := fs.String("name", "", "the user's name (required)")
	admin := fs.Bool("admin", false, "make the user an administrator (manages staff)")
	password := fs.String("password", "", "password (at least 10 characters); generated and printed when empty")
	passwordStdin := fs.Bool("password-stdin", false, "read the password from the first line of standard input")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	var problems []string
	if a, err := mail.ParseAddress(*email); err != nil || a.Address != strings.TrimSpace(*email) {
		problems = append(problems, "--email must be an email address like name@example.org")
	}
	if strings.TrimSpace(*name) == "" {
		problems = append(problems, "--name is required")
	}
	pw := *password
	generated := false
	if *passwordStdin {
		line, _ := bufio.NewReader(stdin).ReadString('\n')
		pw = strings.TrimRight(line, "\r\n")
	}
	if pw == "" {
		pw, generated = auth.GeneratePassword(), true
	}
	if len(pw) < auth.MinPasswordLen || len(pw) > auth.MaxPasswordLen {
		problems = append(problems, fmt.Sprintf("the password must be %d to %d characters long", auth.MinPasswordLen, auth.MaxPasswordLen))
	} else if auth.IsCommonPassword(pw) {
		problems = append(problems, "the password is one of the most common ones, which attackers try first; choose another")
	}
	if len(problems) > 0 {
		for _, p := range problems {
			fmt.Fprintln(stderr, "larder user add:", p)
		}
		return 2
	}
	st, _, closeDB, err := connect(ctx, *dataDir, newLogger(stderr), store.PoolOptions{})
	if err != nil {
		fmt.Fprintln(stderr, "larder:", err)
		return 1
	}
	defer closeDB()
	hash, err := auth.HashPassword(pw)
	if err != nil {
		fmt.Fprintln(stderr, "larder:", err)
		return 1
	}
	role := store.RoleDietitian
	if *admin {
		role = store.RoleAdmin
	}
	u := store.User{Email: strings.TrimSpace(*email), Name: strings.TrimSpace(*name), Role: role, PasswordHash: hash}
	if err := st.CreateUser(ctx, store.System, &u); err != nil {
		if errors.Is(err, store.ErrEmailTaken) {
			fmt.Fprintf(stderr, "larder user add: someone already signs in as %s\n", u.Email)
			return 1
		}
		fmt.Fprintln(stderr, "larder:", err)
		return 1
	}
	fmt.Fprintf(stdout, "Added %s <%s> as %s.\n", u.Name, u.Email, role)
	if generated {
		fmt.Fprintf(stdout, "Password: %s\n", pw)
	}
	return 0
}

func userList(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("user list", flag.ContinueOnError)
	fs.SetOutput(stderr)
	dataDir := fs.String("data-dir", defaultDataDir(), "folder of the private PostgreSQL cluster when DATABASE_URL is not set (env LARDER_DATA_DIR)")
	if err := fs.Parse(args); err != nil {
		return 2
	}
	st, _, closeDB, err := connect(ctx, *dataDir, newLogger(stderr), store.PoolOptions{})
	if err != nil {
		fmt.Fprintln(stderr, "larder:", err)
		return 1
	}
	defer closeDB()
	users, err := st.ListUsers(ctx)
	if err != nil {
		fmt.Fprintln(stderr, "larder:", err)
		return 1
	}
	tw := tabwriter.NewWriter(stdout, 2, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "ID\tEMAIL\tNAME\tROLE\tSTATUS")
	for _, u := range users {
		status := "active"
		if u.Disabled {
			status = "disabled"
		}
		fmt.Fprintf(tw, "%d\t%s\t%s\t%s\t%s\n", u.ID, u.Email, u.Name, u.Role, status)
	}
	tw.Flush()
	return 0
}
