package sweep

import (
	"fmt"
	"os"
	"path/filepath"
)

// Merge joins the folders of a study run in shards into out: the same
// files, byte for byte, as the whole study run in one folder. It refuses
// folders of different studies (another scene or mesh, seed or tool
// version), a shard given twice or missing, and shards that are not
// complete (resume them first).
func Merge(dirs []string, out string) (*Result, error) {
	if len(dirs) == 0 {
		return nil, badf("name the shard folders to merge")
	}
	if out == "" {
		return nil, badf("give the folder to merge into with -o")
	}
	absOut, _ := filepath.Abs(out)
	metas := make([]*Meta, len(dirs))
	for i, d := range dirs {
		if a, _ := filepath.Abs(d); a == absOut {
			return nil, badf("the output folder %s is one of the shards; merge into another folder", out)
		}
		m, err := ReadMeta(d)
		if err != nil {
			return nil, err
		}
		metas[i] = m
	}
	first := metas[0]
	count := 1
	if first.Shard != nil {
		count = first.Shard.Count
	}
	byIndex := make([]string, count+1)
	for i, m := range metas {
		if why := sameStudy(first, m); why != "" {
			return nil, badf("%s is not part of the same study as %s: %s", dirs[i], dirs[0], why)
		}
		k, n := 1, 1
		if m.Shard != nil {
			k, n = m.Shard.Index, m.Shard.Count
		}
		if n != count {
			return nil, badf("%s is shard %d of %d, but %s is a shard of %d", dirs[i], k, n, dirs[0], count)
		}
		if byIndex[k] != "" {
			return nil, badf("shard %d/%d is given twice: %s and %s", k, n, byIndex[k], dirs[i])
		}
		byIndex[k] = dirs[i]
		if !m.Complete || m.TrialsDone != m.TrialsTotal {
			return nil, badf("%s (shard %d/%d) holds %d of its %d trials; finish it with clatter sweep --resume before merging", dirs[i], k, n, m.TrialsDone, m.TrialsTotal)
		}
	}
	var missing []int
	for k := 1; k <= count; k++ {
		if byIndex[k] == "" {
			missing = append(missing, k)
		}
	}
	if len(missing) > 0 {
		return nil, badf("shards %v of %d are missing; merge needs every shard's folder", missing, count)
	}
	if old, err := ReadMeta(out); err == nil {
		if why := sameStudy(first, old); why != "" || old.Shard != nil {
			return nil, badf("%s already holds another sweep; merge into a new folder", out)
		}
	} else if _, serr := os.Stat(filepath.Join(out, TrialsFile)); serr == nil {
		return nil, badf("%s holds a %s but no %s; merge into a new folder", out, TrialsFile, MetaFile)
	}
	lock, err := LockFolder(out)
	if err != nil {
		return nil, err
	}
	defer lock.Release()
	removeTemps(out)
	m := first.clone()
	m.Shard = nil
	m.TrialsTotal = m.Cases * m.Trials
	srcs := byIndex[1:]
	res, err := finish(out, &m, srcs)
	if err != nil {
		return nil, err
	}
	if !m.Complete {
		return res, fmt.Errorf("the shards hold %d of the study's %d trials", m.TrialsDone, m.TrialsTotal)
	}
	return res, nil
}
