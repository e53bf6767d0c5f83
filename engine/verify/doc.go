// Package verify holds the analytic cases that `clatter verify` runs: small
// worlds whose answer is known in closed form from a textbook or handbook,
// simulated through the engine (and one through the scene reader and the
// result writer), each compared with its reference under a tolerance whose
// size is explained beside it. The Go tests run the same cases.
package verify
