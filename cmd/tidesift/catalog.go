package main

import (
	"context"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"strings"

	"tidesift/schema"
	"tidesift/store"
)

// openStore opens the catalog at path. A read-only open of a missing file is
// an error that says how to make one, rather than creating an empty catalog.
func (a *app) openStore(ctx context.Context, path string, readOnly bool) (*store.Store, error) {
	if readOnly {
		if _, err := os.Stat(path); errors.Is(err, fs.ErrNotExist) {
			return nil, &exitErr{code: exitError,
				err:  fmt.Errorf("no catalog at %s", path),
				hint: "Create one with 'tidesift init' or 'tidesift import FILE', or name another with --db."}
		}
	}
	now, err := a.now()
	if err != nil {
		return nil, err
	}
	st, err := store.Open(ctx, path, store.Options{ReadOnly: readOnly})
	if err != nil {
		return nil, fmt.Errorf("open catalog %s: %w", path, err)
	}
	st.Now = now
	return st, nil
}

// findMoon returns the moon of cat called name (matched like natural keys, or
// by alias), on planet when planet is not empty.
func findMoon(cat *schema.Catalog, name, planet string) (*schema.Body, error) {
	key, pkey := schema.NameKey(name), schema.NameKey(planet)
	var found []*schema.Body
	for i := range cat.Moons {
		m := &cat.Moons[i]
		if pkey != "" && schema.NameKey(m.Parent) != pkey {
			continue
		}
		match := schema.NameKey(m.Name) == key
		for _, al := range m.Aliases {
			match = match || schema.NameKey(al) == key
		}
		if match {
			found = append(found, m)
		}
	}
	switch len(found) {
	case 1:
		return found[0], nil
	case 0:
		where := ""
		if planet != "" {
			where = fmt.Sprintf(" of planet %q", planet)
		}
		return nil, &exitErr{code: exitError,
			err:  fmt.Errorf("no moon named %q%s in the catalog at revision %d", name, where, cat.Revision.ID),
			hint: "'tidesift list' shows the moons."}
	}
	var cands []string
	for _, m := range found {
		cands = append(cands, fmt.Sprintf("%s of %s", m.Name, m.Parent))
	}
	return nil, usageError(nil, fmt.Errorf("moon name %q is ambiguous: %s; choose one with --planet", name, strings.Join(cands, ", ")))
}

// filterMoons returns the moons of cat on planet and star ("" matches any).
func filterMoons(cat *schema.Catalog, planet, star string) []*schema.Body {
	pkey, skey := schema.NameKey(planet), schema.NameKey(star)
	var out []*schema.Body
	for i := range cat.Moons {
		m := &cat.Moons[i]
		if pkey != "" && schema.NameKey(m.Parent) != pkey {
			continue
		}
		if skey != "" && schema.NameKey(cat.StarOf(m)) != skey {
			continue
		}
		out = append(out, m)
	}
	return out
}
