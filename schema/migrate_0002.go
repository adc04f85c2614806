package schema

import (
	"context"
	"database/sql"
	"fmt"
	"sort"
)

// goSteps are the migrations that need code as well as SQL: the step of a
// version runs after its SQL file, in the same transaction.
var goSteps = map[int]func(ctx context.Context, tx *sql.Tx) error{
	2: valuesToStates,
}

// valuesToStates fills the state table of version 2 from the value rows of
// version 1 and drops the value table. A body's states are the sets of its
// values current at each revision that set or superseded one of them: the
// same catalog, revision by revision, read the new way.
func valuesToStates(ctx context.Context, tx *sql.Tx) error {
	codes := map[string]uint64{}
	rows, err := tx.QueryContext(ctx, "SELECT code, key FROM key_name")
	if err != nil {
		return err
	}
	for rows.Next() {
		var c uint64
		var k string
		if err := rows.Scan(&c, &k); err != nil {
			rows.Close()
			return err
		}
		codes[k] = c
	}
	rows.Close()
	if err := rows.Err(); err != nil {
		return err
	}
	type row struct {
		code uint64
		p    Param
		sup  int64 // 0: current
	}
	var (
		body   int64 = -1
		vals   []row
		nextID int64 = 1
	)
	ins, err := tx.PrepareContext(ctx, "INSERT INTO state (id, body_id, set_rev, superseded_rev, prev_id, data) VALUES (?, ?, ?, ?, ?, ?)")
	if err != nil {
		return err
	}
	defer ins.Close()
	cur, err := tx.PrepareContext(ctx, "UPDATE body SET state_id = ? WHERE id = ?")
	if err != nil {
		return err
	}
	defer cur.Close()
	flush := func() error {
		if len(vals) == 0 {
			return nil
		}
		events := map[int64]bool{}
		for _, v := range vals {
			events[v.p.Revision] = true
			if v.sup != 0 {
				events[v.sup] = true
			}
		}
		revs := make([]int64, 0, len(events))
		for r := range events {
			revs = append(revs, r)
		}
		sort.Slice(revs, func(i, j int) bool { return revs[i] < revs[j] })
		var prev any // NULL
		var state []StateValue
		for i, r := range revs {
			state = state[:0]
			for _, v := range vals {
				if v.p.Revision <= r && (v.sup == 0 || v.sup > r) {
					state = append(state, StateValue{Code: v.code, Param: v.p})
				}
			}
			if len(state) == 0 {
				continue // every value superseded and none set: nothing held
			}
			sort.Slice(state, func(a, b int) bool { return state[a].Code < state[b].Code })
			var sup any
			if i+1 < len(revs) {
				sup = revs[i+1]
			}
			id := nextID
			nextID++
			if _, err := ins.ExecContext(ctx, id, body, r, sup, prev, AppendState(nil, state)); err != nil {
				return fmt.Errorf("body %d, revision %d: %w", body, r, err)
			}
			prev = id
			if sup == nil {
				if _, err := cur.ExecContext(ctx, id, body); err != nil {
					return err
				}
			}
		}
		vals = vals[:0]
		return nil
	}
	rows, err = tx.QueryContext(ctx, `SELECT body_id, key, value, unc_kind, ifnull(sigma, 0), ifnull(plus, 0), ifnull(minus, 0),
		ifnull(min, 0), ifnull(max, 0), ifnull(factor, 0), source, status, set_rev, ifnull(superseded_rev, 0)
		FROM value ORDER BY body_id, id`)
	if err != nil {
		return err
	}
	defer rows.Close()
	for rows.Next() {
		var (
			id       int64
			r        row
			key, unc string
			status   string
		)
		u := &r.p.Unc
		if err := rows.Scan(&id, &key, &r.p.Value, &unc, &u.Sigma, &u.Plus, &u.Minus, &u.Min, &u.Max, &u.Factor,
			&r.p.Source, &status, &r.p.Revision, &r.sup); err != nil {
			return err
		}
		if u.Kind, err = ParseUncKind(unc); err != nil {
			return fmt.Errorf("body %d, %s: %w", id, key, err)
		}
		r.p.Status = Status(status)
		c, ok := codes[key]
		if !ok {
			return fmt.Errorf("body %d: stored key %q is not a key of schema version 2", id, key)
		}
		r.code = c
		if id != body {
			if err := flush(); err != nil {
				return err
			}
			body = id
		}
		vals = append(vals, r)
	}
	if err := rows.Err(); err != nil {
		return err
	}
	rows.Close()
	if err := flush(); err != nil {
		return err
	}
	_, err = tx.ExecContext(ctx, "DROP TABLE value")
	return err
}
