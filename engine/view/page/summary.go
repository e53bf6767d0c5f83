package page

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
)

// summaryTables turns a JSON result file (summary.json of a run,
// sweep.json of a study) into tables: one of its plain values, and one
// for each list of records in it (bodies, joints, a body's faces).
func summaryTables(path string) ([]table, string, error) {
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, "", err
	}
	var v map[string]any
	if err := json.Unmarshal(b, &v); err != nil {
		return nil, "", err
	}
	name := filepath.Base(path)
	facts := table{Name: name, Head: []string{"item", "value"}, Open: true}
	var lists []table
	for _, k := range sortedKeys(v) {
		switch x := v[k].(type) {
		case map[string]any:
			for _, k2 := range sortedKeys(x) {
				if s, ok := cell(x[k2]); ok {
					facts.Rows = append(facts.Rows, []string{k + " " + k2, s})
				}
			}
		case []any:
			if recs := records(x); recs != nil {
				lists = append(lists, recordTables(name+": "+k, recs)...)
			} else if s, ok := cell(x); ok {
				facts.Rows = append(facts.Rows, []string{k, s})
			}
		default:
			if s, ok := cell(x); ok {
				facts.Rows = append(facts.Rows, []string{k, s})
			}
		}
	}
	out, _ := json.MarshalIndent(v, "", "  ")
	return append([]table{facts}, lists...), string(out), nil
}

// records returns a list's elements if they are all objects.
func records(list []any) []map[string]any {
	if len(list) == 0 {
		return nil
	}
	out := make([]map[string]any, len(list))
	for i, x := range list {
		m, ok := x.(map[string]any)
		if !ok {
			return nil
		}
		out[i] = m
	}
	return out
}

// recordTables makes a table of records, columns in the order of the
// first record's keys (sorted, with name first), and a table of its own
// for each list of records inside a record.
func recordTables(title string, recs []map[string]any) []table {
	var cols []string
	for _, k := range sortedKeys(recs[0]) {
		if l, ok := recs[0][k].([]any); ok && records(l) != nil {
			continue
		}
		cols = append(cols, k)
	}
	first := map[string]int{"name": 1, "face": 2, "body": 3, "time": 4}
	sort.SliceStable(cols, func(i, j int) bool {
		a, b := first[cols[i]], first[cols[j]]
		return a != 0 && (b == 0 || a < b)
	})
	t := table{Name: title, Head: cols, Open: true}
	var inner []table
	for _, r := range recs {
		row := make([]string, len(cols))
		for i, c := range cols {
			row[i], _ = cell(r[c])
		}
		t.Rows = append(t.Rows, row)
		for _, k := range sortedKeys(r) {
			if l, ok := r[k].([]any); ok {
				if sub := records(l); sub != nil {
					label := fmt.Sprint(r["name"])
					inner = append(inner, recordTables(title+" "+label+" "+k, sub)...)
				}
			}
		}
	}
	return append([]table{t}, inner...)
}

// cell writes a plain value, or a list of plain values, for a table.
func cell(v any) (string, bool) {
	switch x := v.(type) {
	case nil:
		return "-", true
	case string:
		return x, true
	case float64:
		return fmt.Sprintf("%.6g", x), true
	case bool:
		return fmt.Sprint(x), true
	case []any:
		parts := make([]string, len(x))
		for i, e := range x {
			s, ok := cell(e)
			if !ok {
				return "", false
			}
			parts[i] = s
		}
		return strings.Join(parts, ", "), true
	case map[string]any:
		var parts []string
		for _, k := range sortedKeys(x) {
			s, ok := cell(x[k])
			if !ok {
				return "", false
			}
			parts = append(parts, k+" "+s)
		}
		return strings.Join(parts, "; "), true
	}
	return "", false
}

func sortedKeys[V any](m map[string]V) []string {
	keys := make([]string, 0, len(m))
	for k := range m {
		keys = append(keys, k)
	}
	sort.Strings(keys)
	return keys
}
