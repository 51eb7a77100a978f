package calc

import (
	"slices"
	"strings"
)

// KeyLines maps every key of a TOML document, dotted with its table
// ("expect.displacement"), to the 1-based line that sets it, so that errors
// can point at the line. BurntSushi/toml keeps key positions private.
func KeyLines(src string) map[string]int {
	lines := map[string]int{}
	scanKeys(src, func(key string, line int) {
		if _, ok := lines[key]; !ok {
			lines[key] = line
		}
	})
	return lines
}

// keyLine is a key of a TOML document, as KeyLines names it, with the
// 1-based line that sets it.
type keyLine struct {
	key  string
	line int32
}

// keyLineList is what KeyLines finds as a list sorted by key, the first
// line of each: a block keeps it while the site is built, and a list takes
// a fraction of a map's memory.
func keyLineList(src string) []keyLine {
	list := make([]keyLine, 0, strings.Count(src, "\n")+1)
	scanKeys(src, func(key string, line int) { list = append(list, keyLine{key: key, line: int32(line)}) })
	// Stable: of a key set twice, the first line stays first.
	slices.SortStableFunc(list, func(a, b keyLine) int { return strings.Compare(a.key, b.key) })
	list = slices.CompactFunc(list, func(a, b keyLine) bool { return a.key == b.key })
	if len(list) < cap(list) {
		list = slices.Clone(list) // blank lines and comments left room
	}
	return list
}

// scanKeys calls found for every key of a TOML document, dotted with its
// table, and the 1-based line that sets it, in the order of the lines.
func scanKeys(src string, found func(key string, line int)) {
	table := ""
	inMultiline := ""
	for i, line := range strings.Split(src, "\n") {
		if inMultiline != "" {
			if strings.Count(line, inMultiline)%2 == 1 {
				inMultiline = ""
			}
			continue
		}
		t := strings.TrimSpace(line)
		if t == "" || t[0] == '#' {
			continue
		}
		if t[0] == '[' {
			name := strings.Trim(t, "[] \t")
			if j := strings.IndexByte(name, '#'); j >= 0 {
				name = strings.TrimRight(strings.Trim(name[:j], "] \t"), " ")
			}
			table = unquoteKey(name)
			found(table, i+1)
			continue
		}
		eq := strings.IndexByte(t, '=')
		if eq <= 0 {
			continue
		}
		key := unquoteKey(strings.TrimSpace(t[:eq]))
		if table != "" {
			key = table + "." + key
		}
		found(key, i+1)
		rest := t[eq+1:]
		for _, q := range []string{`"""`, `'''`} {
			if strings.Count(rest, q)%2 == 1 {
				inMultiline = q
			}
		}
	}
}

// unquoteKey removes quotes around the parts of a dotted key.
func unquoteKey(k string) string {
	parts := strings.Split(k, ".")
	for i, p := range parts {
		parts[i] = strings.Trim(strings.TrimSpace(p), `"'`)
	}
	return strings.Join(parts, ".")
}
