package sampledata

import (
	"embed"
	"path"
	"sort"
	"strings"
)

// The built-in scoring profiles, one TOML file each; the file name without
// ".toml" is the profile's name. Package rank/profile parses them.
//
//go:embed profiles/*.toml
var profileFS embed.FS

// Profiles returns the built-in scoring profiles' TOML sources by name
// ("ocean", "tidal", "volatiles"). The map is a fresh copy; callers may keep it.
func Profiles() map[string][]byte {
	ents, err := profileFS.ReadDir("profiles")
	if err != nil {
		panic(err) // the embed directive guarantees the directory
	}
	out := make(map[string][]byte, len(ents))
	for _, e := range ents {
		b, err := profileFS.ReadFile(path.Join("profiles", e.Name()))
		if err != nil {
			panic(err)
		}
		out[strings.TrimSuffix(e.Name(), ".toml")] = b
	}
	return out
}

// ProfileNames returns the names of the built-in profiles, sorted.
func ProfileNames() []string {
	m := Profiles()
	out := make([]string, 0, len(m))
	for k := range m {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}
