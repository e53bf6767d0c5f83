package sweep

import (
	"fmt"
	"strconv"
	"strings"
)

// Shard is part K (from 1) of a study split into N parts; the zero Shard
// is the whole study. Shard K runs the trials whose global index
// (case x trials + trial) lies in [(K-1) T / N, K T / N), T the study's
// trials: contiguous blocks, as even as whole trials allow.
type Shard struct {
	Index int `json:"index"`
	Count int `json:"count"`
}

// Whole reports whether s is the whole study (no shard or shard 1 of 1).
func (s Shard) Whole() bool { return s.Count <= 1 }

func (s Shard) String() string {
	if s.Count == 0 {
		return "1/1"
	}
	return fmt.Sprintf("%d/%d", s.Index, s.Count)
}

// maxShards bounds N: a larger count is far more likely a slip than a
// cluster of that many nodes.
const maxShards = 1000000

// ParseShard reads "K/N", 1 <= K <= N.
func ParseShard(text string) (Shard, error) {
	k, n, ok := strings.Cut(strings.TrimSpace(text), "/")
	if !ok {
		return Shard{}, fmt.Errorf("shard %q: write K/N, shard K of N counted from 1, e.g. 2/8", text)
	}
	ki, err1 := strconv.Atoi(strings.TrimSpace(k))
	ni, err2 := strconv.Atoi(strings.TrimSpace(n))
	if err1 != nil || err2 != nil {
		return Shard{}, fmt.Errorf("shard %q: K and N must be whole numbers, e.g. 2/8", text)
	}
	return checkShard(ki, ni, fmt.Sprintf("shard %q", text))
}

func checkShard(k, n int, what string) (Shard, error) {
	if n < 1 || n > maxShards {
		return Shard{}, fmt.Errorf("%s: the number of shards must be from 1 to %d, got %d", what, maxShards, n)
	}
	if k < 1 || k > n {
		return Shard{}, fmt.Errorf("%s: K must be from 1 to N = %d (shards count from 1), got %d", what, n, k)
	}
	return Shard{Index: k, Count: n}, nil
}

// Environment variables that give a shard.
const (
	// EnvShardCount gives the number of shards of a Kubernetes Indexed Job
	// (its completions), which the Job does not pass to its pods.
	EnvShardCount = "CLATTER_SHARD_COUNT"
	// EnvJobIndex is the index (from 0) of a pod of a Kubernetes Indexed Job.
	EnvJobIndex = "JOB_COMPLETION_INDEX"
	// Slurm job arrays: the task's id, the number of tasks, the lowest id
	// and the step between ids.
	EnvSlurmID    = "SLURM_ARRAY_TASK_ID"
	EnvSlurmCount = "SLURM_ARRAY_TASK_COUNT"
	EnvSlurmMin   = "SLURM_ARRAY_TASK_MIN"
	EnvSlurmStep  = "SLURM_ARRAY_TASK_STEP"
)

// ShardFromEnv reads the shard of an array job from its environment:
// a Kubernetes Indexed Job (JOB_COMPLETION_INDEX from 0, with the number of
// shards from count if above 0, else from CLATTER_SHARD_COUNT) or a Slurm
// job array (SLURM_ARRAY_TASK_ID, SLURM_ARRAY_TASK_COUNT and
// SLURM_ARRAY_TASK_MIN, so that --array=0-7 and --array=1-8 both make
// shards 1 to 8). It returns the zero Shard and an empty source when
// neither is set; source names the variables used, for messages.
func ShardFromEnv(getenv func(string) string, count int) (s Shard, source string, err error) {
	num := func(name string) (int, bool, error) {
		v := strings.TrimSpace(getenv(name))
		if v == "" {
			return 0, false, nil
		}
		i, err := strconv.Atoi(v)
		if err != nil {
			return 0, true, fmt.Errorf("%s=%q is not a whole number", name, v)
		}
		return i, true, nil
	}
	if idx, ok, err := num(EnvJobIndex); err != nil || ok {
		if err != nil {
			return Shard{}, "", err
		}
		n := count
		src := fmt.Sprintf("%s=%d and the shard count %d", EnvJobIndex, idx, n)
		if n <= 0 {
			c, ok, err := num(EnvShardCount)
			if err != nil {
				return Shard{}, "", err
			}
			if !ok {
				return Shard{}, "", fmt.Errorf("%s is set (a Kubernetes Indexed Job) but not the number of shards: set %s to the Job's completions, or give --shard-count", EnvJobIndex, EnvShardCount)
			}
			n = c
			src = fmt.Sprintf("%s=%d and %s=%d", EnvJobIndex, idx, EnvShardCount, n)
		}
		s, err := checkShard(idx+1, n, src)
		return s, src, err
	}
	id, ok, err := num(EnvSlurmID)
	if err != nil {
		return Shard{}, "", err
	}
	if !ok {
		return Shard{}, "", nil
	}
	n, okN, err := num(EnvSlurmCount)
	if err != nil {
		return Shard{}, "", err
	}
	lo, okMin, err := num(EnvSlurmMin)
	if err != nil {
		return Shard{}, "", err
	}
	step, okStep, err := num(EnvSlurmStep)
	if err != nil {
		return Shard{}, "", err
	}
	if !okN || !okMin {
		return Shard{}, "", fmt.Errorf("%s is set (a Slurm job array) but not %s and %s", EnvSlurmID, EnvSlurmCount, EnvSlurmMin)
	}
	if !okStep || step < 1 {
		step = 1
	}
	src := fmt.Sprintf("%s=%d of %s=%d from %s=%d", EnvSlurmID, id, EnvSlurmCount, n, EnvSlurmMin, lo)
	if (id-lo)%step != 0 {
		return Shard{}, "", fmt.Errorf("%s: the array's ids are not evenly spaced; use a range such as --array=1-%d", src, n)
	}
	s, err = checkShard((id-lo)/step+1, n, src)
	if err != nil {
		return Shard{}, "", fmt.Errorf("%v; use a range such as --array=1-%d", err, n)
	}
	return s, src, nil
}

// span returns the global trial indices [lo, hi) of the shard in a study
// of total trials.
func (s Shard) span(total int64) (lo, hi int64) {
	if s.Whole() {
		return 0, total
	}
	k, n := int64(s.Index), int64(s.Count)
	// total < 2^40 (maxStudyTrials) and n <= 1e6 < 2^20: no overflow.
	return (k - 1) * total / n, k * total / n
}
