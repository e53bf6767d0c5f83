// Command clatter simulates rigid parts tumbling, sliding and coming to
// rest: one scene at a time (run), the built-in example study (demo), the
// mass properties and resting faces of an STL part (inspect), and the
// analytic validation cases (verify).
//
// Exit codes: 0 ok, 1 the simulation failed, 2 bad input. Results go to
// stdout, messages to stderr.
package main
