package server

import (
	"fmt"
	"math"
	"time"

	"larder/internal/store"
)

// Sign-in throttling. Guessing is slowed per (email, address) and per
// address, never per email alone: a stranger's wrong guesses make the
// stranger wait, while the account's owner signs in as usual from their own
// network. Past a few free tries each further failure doubles the wait
// before the next try, up to a ceiling, which keeps honest typos painless
// and makes a dictionary attack from one place hopeless (thousands of
// guesses a day at most).
const (
	signInWindow = time.Hour // failures older than this no longer count

	pairFree    = 5 // failed tries of one email from one address before any wait
	pairMaxWait = 15 * time.Minute

	addressFree    = 20 // failed tries of any emails from one address (spraying many accounts)
	addressMaxWait = 30 * time.Minute
)

// growingWait is the wait after failures failed tries of which free cost
// nothing: 1 s after the first one over, doubling with each, up to max.
func growingWait(failures, free int, max time.Duration) time.Duration {
	over := failures - free
	if over <= 0 {
		return 0
	}
	if over > 30 {
		return max
	}
	d := time.Duration(math.Pow(2, float64(over-1))) * time.Second
	return min(d, max)
}

// signInWait is how long this address must wait before trying this email
// again (0: go ahead), and whether the address as a whole is the cause.
func signInWait(c store.SignInFailureCounts) (time.Duration, bool) {
	pair := c.PairLast.Add(growingWait(c.Pair, pairFree, pairMaxWait)).Sub(c.Now)
	addr := c.AddressLast.Add(growingWait(c.Address, addressFree, addressMaxWait)).Sub(c.Now)
	if addr > 0 && addr >= pair {
		return addr, true
	}
	return max(pair, 0), false
}

// waitWords says a wait in plain words, rounded up.
func waitWords(d time.Duration) string {
	if d <= time.Minute {
		s := int(math.Ceil(d.Seconds()))
		if s == 1 {
			return "1 second"
		}
		return fmt.Sprintf("%d seconds", s)
	}
	m := int(math.Ceil(d.Minutes()))
	return fmt.Sprintf("%d minutes", m)
}

// throttleMessage is shown beside the password when a try comes too soon.
func throttleMessage(d time.Duration, wholeAddress bool) string {
	who := "for this email from your network"
	if wholeAddress {
		who = "from your network"
	}
	return "Too many wrong passwords " + who + ". Wait " + waitWords(d) + " and try again. " +
		"Your account is not locked: you can still sign in from another network, or ask an administrator of the practice to reset your password."
}
