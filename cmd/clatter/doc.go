// Command clatter simulates rigid parts tumbling, sliding and coming to
// rest: one scene at a time (run), the built-in example study (demo), the
// mass properties and resting faces of an STL part (inspect), and the
// analytic validation cases (verify).
//
// Exit codes: 0 ok; 1 the simulation failed, or a study was interrupted;
// 2 bad input; 3 a study finished but some trials failed; 70 an internal
// error (a panic, caught and reported). Results go to stdout, messages to
// stderr.
package main
