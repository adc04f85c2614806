-- 0002: a body's values are stored together, one state row per body and
-- revision that changed it, instead of one row per value.
--
-- state.data is the encoding of schema/state.go: every value current in the
-- state (key code, value, uncertainty, status, source, and the revision that
-- set the value, which may be older than the state). The catalog as of
-- revision R is the states with
--   set_rev <= R AND (superseded_rev IS NULL OR superseded_rev > R),
-- at most one per body. body.state_id names a body's current state and
-- state.prev_id the state it superseded, so a body's history is a chain.
-- Neither of the two carries a REFERENCES clause: both point at rows written
-- in the same transaction in either order, and `tidesift check` verifies them.
-- The migration's Go step (schema/migrate_0002.go) fills state from value
-- and then drops value.

CREATE TABLE key_name (
	code INTEGER PRIMARY KEY CHECK (code > 0),
	key  TEXT    NOT NULL UNIQUE CHECK (key <> '')
);

-- The keys of schema version 2, in the registry's order. Keys added later
-- get the next free code when first stored.
INSERT INTO key_name (code, key) VALUES
	(1, 'mass'), (2, 'radius'), (3, 'density'), (4, 'semi_major_axis'),
	(5, 'eccentricity'), (6, 'obliquity'), (7, 'period'), (8, 'k2_q'),
	(9, 'k2'), (10, 'q'), (11, 'bond_albedo'), (12, 'surface_temperature'),
	(13, 'moment_of_inertia'), (14, 'atmosphere_column'), (15, 'planet_mass'),
	(16, 'planet_radius'), (17, 'star_distance'), (18, 'star_luminosity'),
	(19, 'star_mass');

CREATE TABLE state (
	id             INTEGER PRIMARY KEY,
	body_id        INTEGER NOT NULL REFERENCES body (id),
	set_rev        INTEGER NOT NULL REFERENCES revision (id),
	superseded_rev INTEGER REFERENCES revision (id),
	prev_id        INTEGER, -- the state this one superseded; NULL for the first
	data           BLOB    NOT NULL CHECK (length(data) > 0),
	CHECK (superseded_rev IS NULL OR superseded_rev > set_rev)
);
-- No index on state: imports append to it, snapshots and diffs scan it, and
-- a body's states are reached through body.state_id and prev_id. Each index
-- would cost a large import about a sixth of its speed.

ALTER TABLE body ADD COLUMN state_id INTEGER; -- the current state; NULL before the first value

-- The natural key leads with name_key, so that it also finds planets and
-- moons by name alone (body_key's job in version 1), with one index to
-- maintain instead of two.
DROP INDEX body_key;
DROP INDEX body_natural;
CREATE UNIQUE INDEX body_natural ON body (name_key, kind, ifnull(parent_id, 0));
