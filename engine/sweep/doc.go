// Package sweep runs a scene's [sweep] section as a study of many trials:
// every combination of the varied values is a case, and every case runs
// its trials, each in a world of its own with its own random draws
// (starting orientation, position and velocity jitter, drop height, spin).
//
// A trial's draws come from a generator seeded by (sweep seed, case,
// trial) alone, so the results do not depend on the number of workers, the
// order trials finish in, or how the study is split into shards.
//
// Results go to a folder: trials.csv (a row per trial and moving body,
// appended as trials finish, so that an interrupted study keeps every
// finished row and a resumed one runs only the rest), cases.csv (the
// fraction of trials that rest on each face, with 95 percent Wilson
// intervals), sweep.json (the study as run) and PNG plots. Run runs the
// trials; Finish turns a folder of finished trials into the files in case
// and trial order, identical byte for byte however the trials were run;
// Merge joins the folders of a sharded study into one.
package sweep
