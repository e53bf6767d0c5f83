package main

var cmdSweep = &command{
	name:    "sweep",
	summary: "run a scene's [sweep] section as many trials (not built yet)",
	usage:   "clatter sweep SCENE.toml [-o DIR] [-j WORKERS] [--shard K/N] [--resume]",
	help: `
Runs the scene's [sweep] section: every combination of the varied values is
a case, and every case runs its trials with their own random draws. Not
built yet: this version answers with exit code 2. clatter run reads and
checks the [sweep] section already.`,
	run: notBuilt("sweep"),
}

var cmdMerge = &command{
	name:    "merge",
	summary: "join the outputs of sharded sweeps (not built yet)",
	usage:   "clatter merge SHARD_DIR... -o DIR",
	help: `
Joins the output folders of a sweep run in shards into one, identical to a
single run's. Not built yet: this version answers with exit code 2.`,
	run: notBuilt("merge"),
}
