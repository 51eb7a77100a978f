package calc

import (
	"strings"
)

// KeyLines maps every key of a TOML document, dotted with its table
// ("expect.displacement"), to the 1-based line that sets it, so that errors
// can point at the line. BurntSushi/toml keeps key positions private.
func KeyLines(src string) map[string]int {
	lines := map[string]int{}
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
			if _, ok := lines[table]; !ok {
				lines[table] = i + 1
			}
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
		if _, ok := lines[key]; !ok {
			lines[key] = i + 1
		}
		rest := t[eq+1:]
		for _, q := range []string{`"""`, `'''`} {
			if strings.Count(rest, q)%2 == 1 {
				inMultiline = q
			}
		}
	}
	return lines
}

// unquoteKey removes quotes around the parts of a dotted key.
func unquoteKey(k string) string {
	parts := strings.Split(k, ".")
	for i, p := range parts {
		parts[i] = strings.Trim(strings.TrimSpace(p), `"'`)
	}
	return strings.Join(parts, ".")
}
