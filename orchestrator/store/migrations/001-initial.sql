-- Base tables of a disksweep store. Parameter and output columns are not listed here: after migrating, the
-- store adds one typed column per entry of the parameter table and the output registry (registry-columns.ts),
-- so a new parameter or output needs no migration. Times are integers: milliseconds since the Unix epoch.
--
-- Keys. A sweep has an integer sweep_key; a point has an integer point_key = sweep_key * 2^32 + point_index
-- (see point-keys.ts), so a sweep's points, results, checkpoints and series are each one contiguous key range,
-- new rows append at the end of their B-trees, and the key is the same in every database that holds the same
-- sweep as its first one. The text ids (sweep_id: 64 hex, point_id: 32 hex) are indexed once, in sweeps and
-- in points (UNIQUE (sweep_key, point_id)); the tables below them are keyed by point_key alone.
--
-- points and results repeat sweep_id and point_id in plain (unindexed) columns, and the views checkpoints and
-- series add them to their tables, so every table reads on its own in plain SQL.

CREATE TABLE sweeps (
  sweep_key     INTEGER PRIMARY KEY,
  sweep_id      TEXT    NOT NULL UNIQUE,       -- hash of the canonical spec (without name, description, chunks)
  name          TEXT    NOT NULL,
  description   TEXT,
  spec_json     TEXT    NOT NULL,              -- the spec as given, canonical JSON
  spec_hash     TEXT    NOT NULL,
  model_version TEXT    NOT NULL,
  n_points      INTEGER NOT NULL CHECK (n_points >= 0 AND n_points <= 4294967296),
  chunk_size    INTEGER NOT NULL CHECK (chunk_size >= 1),  -- calibrated once; a resume never moves chunk boundaries
  created_at    INTEGER NOT NULL,
  updated_at    INTEGER NOT NULL               -- last time a result of this sweep was written
);

CREATE TABLE points (
  point_key   INTEGER PRIMARY KEY,             -- sweep_key * 2^32 + point_index
  sweep_key   INTEGER NOT NULL REFERENCES sweeps (sweep_key) ON DELETE CASCADE,
  point_id    TEXT    NOT NULL,                -- hash of the resolved model input plus model version
  point_index INTEGER NOT NULL CHECK (point_index >= 0),  -- where the point was first written (its key's low part)
  sweep_id    TEXT    NOT NULL,                -- = sweeps.sweep_id, for plain-SQL readers
  UNIQUE (sweep_key, point_id)
);

-- One row per point that has an outcome. Deterministic outputs (status, scalar columns, steps) are apart from
-- timing and provenance (wall_ms, worker_host, finished_at), which differ between identical runs.
CREATE TABLE results (
  point_key      INTEGER PRIMARY KEY REFERENCES points (point_key) ON DELETE CASCADE,
  sweep_key      INTEGER NOT NULL,             -- = points.sweep_key, for the index below
  sweep_id       TEXT    NOT NULL,             -- = points.sweep_id and points.point_id, for plain-SQL readers
  point_id       TEXT    NOT NULL,
  status         TEXT    NOT NULL,             -- a model status (ok, step_limit, ...) or infrastructure_error
  status_reason  TEXT,
  model_version  TEXT,                         -- as reported by the model; NULL for infrastructure errors
  steps          INTEGER,
  rejected_steps INTEGER,
  wall_ms        REAL,
  worker_host    TEXT    NOT NULL,
  finished_at    INTEGER NOT NULL
);
-- Covers what resume and status ask of a running sweep (points with a result, counts by status, finish
-- times) without touching the wide result rows; small entries that append, as finish times grow.
CREATE INDEX results_progress ON results (sweep_key, status, finished_at);

-- One row per point and checkpoint; the primary key is the whole index (no rowid, no second copy of the key).
CREATE TABLE checkpoint_rows (
  point_key INTEGER NOT NULL REFERENCES results (point_key) ON DELETE CASCADE,
  t_myr     REAL    NOT NULL,
  PRIMARY KEY (point_key, t_myr)
) WITHOUT ROWID;

-- The compact time series: data holds n_samples rows of the listed columns as float32 little-endian,
-- row-major, exactly the bytes the model produced.
CREATE TABLE series_rows (
  point_key INTEGER PRIMARY KEY REFERENCES results (point_key) ON DELETE CASCADE,
  columns   TEXT    NOT NULL,                  -- JSON array of column names
  n_samples INTEGER NOT NULL CHECK (n_samples >= 0),
  data      BLOB    NOT NULL
);

-- The same rows with the sweep and point ids in front (c.* and r.* follow columns added later).
CREATE VIEW checkpoints AS
  SELECT s.sweep_id, p.point_id, c.*
  FROM checkpoint_rows c JOIN points p ON p.point_key = c.point_key JOIN sweeps s ON s.sweep_key = p.sweep_key;

CREATE VIEW series AS
  SELECT s.sweep_id, p.point_id, r.*
  FROM series_rows r JOIN points p ON p.point_key = r.point_key JOIN sweeps s ON s.sweep_key = p.sweep_key;

-- Who is running a sweep on this database. scope is '*' for the whole database or a sweep_id.
CREATE TABLE locks (
  scope        TEXT    NOT NULL PRIMARY KEY,
  host         TEXT    NOT NULL,
  pid          INTEGER NOT NULL,
  started_at   INTEGER NOT NULL,
  heartbeat_at INTEGER NOT NULL
);
