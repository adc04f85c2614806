-- 0001: the full catalog design.
--
-- A revision is one import or edit. Bodies (stars, planets, moons) are
-- identified by (kind, parent, name_key); name_key is schema.NameKey(name).
-- Every numeric parameter value is one row of value: the revision that set it
-- (set_rev) and the revision that superseded it (superseded_rev, NULL while
-- current). The catalog as of revision R is therefore
--   set_rev <= R AND (superseded_rev IS NULL OR superseded_rev > R).
-- Values are in the SI unit of their key (schema.Keys).

CREATE TABLE revision (
	id      INTEGER PRIMARY KEY AUTOINCREMENT, -- AUTOINCREMENT: ids never reused, so they stay monotonic
	time    TEXT    NOT NULL CHECK (time <> ''), -- RFC 3339 UTC with nanoseconds
	file    TEXT    NOT NULL DEFAULT '',
	sha256  TEXT    NOT NULL DEFAULT '' CHECK (sha256 = '' OR length(sha256) = 64),
	note    TEXT    NOT NULL DEFAULT '',
	changes INTEGER NOT NULL DEFAULT 0 CHECK (changes >= 0) -- values added or changed
);

-- A file is imported once; edits carry no digest.
CREATE UNIQUE INDEX revision_sha256 ON revision (sha256) WHERE sha256 <> '';

CREATE TABLE body (
	id          INTEGER PRIMARY KEY,
	kind        TEXT    NOT NULL CHECK (kind IN ('star', 'planet', 'moon')),
	name        TEXT    NOT NULL CHECK (name <> ''),
	name_key    TEXT    NOT NULL CHECK (name_key <> ''),
	parent_id   INTEGER REFERENCES body (id),
	created_rev INTEGER NOT NULL REFERENCES revision (id),
	-- A star has no parent, a moon always has its planet; a planet may have no star.
	CHECK ((kind = 'star' AND parent_id IS NULL)
	    OR (kind = 'moon' AND parent_id IS NOT NULL)
	    OR kind = 'planet')
);

-- The natural key. ifnull: NULL parents must collide too.
CREATE UNIQUE INDEX body_natural ON body (kind, ifnull(parent_id, 0), name_key);
-- Planets named without their star are found by name alone.
CREATE INDEX body_key ON body (name_key);

-- Other names of a moon, matched like names.
CREATE TABLE alias (
	body_id  INTEGER NOT NULL REFERENCES body (id),
	name     TEXT    NOT NULL CHECK (name <> ''),
	name_key TEXT    NOT NULL CHECK (name_key <> ''),
	rev      INTEGER NOT NULL REFERENCES revision (id), -- the revision that added it
	PRIMARY KEY (body_id, name_key)
) WITHOUT ROWID;

CREATE INDEX alias_key ON alias (name_key);

CREATE TABLE value (
	id             INTEGER PRIMARY KEY,
	body_id        INTEGER NOT NULL REFERENCES body (id),
	key            TEXT    NOT NULL CHECK (key <> ''),
	value          REAL    NOT NULL,
	unc_kind       TEXT    NOT NULL, -- none, symmetric, asymmetric, range or factor: see the CHECK below
	-- The fields of the uncertainty's kind are set; the others are NULL.
	sigma          REAL,
	plus           REAL,
	minus          REAL,
	min            REAL,
	max            REAL,
	factor         REAL,
	source         TEXT    NOT NULL DEFAULT '',
	status         TEXT    NOT NULL CHECK (status IN ('measured', 'assumed')),
	set_rev        INTEGER NOT NULL REFERENCES revision (id),
	superseded_rev INTEGER REFERENCES revision (id),
	CHECK (superseded_rev IS NULL OR superseded_rev > set_rev),
	-- One CASE rather than a CHECK per column: as strict, and it made bulk
	-- imports about a fifth faster (fewer expressions per inserted row).
	CHECK (CASE unc_kind
		WHEN 'none'       THEN coalesce(sigma, plus, minus, min, max, factor) IS NULL
		WHEN 'symmetric'  THEN sigma IS NOT NULL AND coalesce(plus, minus, min, max, factor) IS NULL
		WHEN 'asymmetric' THEN plus IS NOT NULL AND minus IS NOT NULL AND coalesce(sigma, min, max, factor) IS NULL
		WHEN 'range'      THEN min IS NOT NULL AND max IS NOT NULL AND coalesce(sigma, plus, minus, factor) IS NULL
		WHEN 'factor'     THEN factor IS NOT NULL AND coalesce(sigma, plus, minus, min, max) IS NULL
		ELSE 0 END)
);

-- One index does three jobs: at most one current value (superseded_rev NULL,
-- indexed as 0) per body and key; at most one value of a body and key
-- superseded by any one revision; and the lookup of a body's current values
-- and history. Snapshots scan the table. Each further index costs imports
-- about a fifth of their speed (measured with store's BenchmarkImport).
CREATE UNIQUE INDEX value_key ON value (body_id, key, ifnull(superseded_rev, 0));
