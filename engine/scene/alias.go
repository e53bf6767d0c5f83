package scene

// renamedKeys maps the old name of a key renamed in a release to its new
// name. An old name is read for one release with a warning that names the
// new one, in any section that knows the new name and not the old.
var renamedKeys = map[string]string{}

// renamed moves the value of key, an old name whose new name the section
// knows, to the new name, and warns; it reports whether it did.
func (r *reader) renamed(sec section, key string, known map[string]bool) bool {
	to, ok := renamedKeys[key]
	if !ok || !known[to] {
		return false
	}
	if _, both := sec.m[to]; both {
		r.errAt(sub(sec.path, key), "%s%s and %s are the old and new names of one key; keep only %s", sec.pre, key, to, to)
		return true
	}
	sec.m[to] = sec.m[key]
	delete(sec.m, key)
	if r.moved == nil {
		r.moved = map[string][]string{}
	}
	r.moved[pathKey(sub(sec.path, to))] = sub(sec.path, key)
	r.warnAt(sub(sec.path, key), "%s%s is now called %s; the old name is read until the next release", sec.pre, key, to)
	return true
}
