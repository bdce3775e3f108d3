package setup

import (
	"bytes"
	"strings"
)

// keyLines maps each dotted key of a TOML text ("tank.vessel_radius_cm")
// and each table header ("tank") to the line (from 1) where it first
// appears, so that an error about a value can name its line. The TOML
// library checks the syntax and reports the lines of syntax and type
// errors itself but keeps the lines of keys private; this scan finds
// them in the forms a description uses: [table] headers, bare, quoted or
// dotted keys at the start of a line. A key it cannot place (inside an
// inline table, say) is absent, and the error then names its table's
// line or none.
func keyLines(data []byte) map[string]int {
	lines := make(map[string]int)
	table := ""
	inString := false // inside a multi-line string
	for i, raw := range bytes.Split(data, []byte("\n")) {
		line := strings.TrimSpace(string(raw))
		// Multi-line strings: skip their body, a rough but safe rule (a
		// missed key costs only a line number in an error).
		if n := strings.Count(line, `"""`) + strings.Count(line, `'''`); n%2 == 1 {
			inString = !inString
			if !inString {
				continue
			}
		}
		if inString || line == "" || line[0] == '#' {
			continue
		}
		if line[0] == '[' {
			end := strings.IndexByte(line, ']')
			if end < 0 {
				continue
			}
			table = normalizeKey(strings.Trim(line[:end], "[] \t"))
			record(lines, table, i+1)
			continue
		}
		eq := strings.IndexByte(line, '=')
		if eq <= 0 {
			continue
		}
		key := normalizeKey(line[:eq])
		if key == "" {
			continue
		}
		if table != "" {
			key = table + "." + key
		}
		record(lines, key, i+1)
	}
	return lines
}

func record(lines map[string]int, key string, line int) {
	if _, ok := lines[key]; !ok {
		lines[key] = line
	}
}

// normalizeKey removes the blanks around the dots of a dotted key and the
// quotes of quoted parts: ` a . "b" ` becomes "a.b".
func normalizeKey(k string) string {
	parts := strings.Split(k, ".")
	for i, p := range parts {
		p = strings.TrimSpace(p)
		if len(p) >= 2 && (p[0] == '"' || p[0] == '\'') && p[len(p)-1] == p[0] {
			p = p[1 : len(p)-1]
		}
		parts[i] = p
	}
	return strings.Join(parts, ".")
}
