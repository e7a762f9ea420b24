-- Base tables of a disksweep store. Parameter and output columns are not listed here: after migrating, the
-- store adds one typed column per entry of the parameter table and the output registry (registry-columns.ts),
-- so a new parameter or output needs no migration. Times are integers: milliseconds since the Unix epoch.

CREATE TABLE sweeps (
  sweep_id      TEXT    NOT NULL PRIMARY KEY,  -- hash of the canonical spec (without name, description, chunks)
  name          TEXT    NOT NULL,
  description   TEXT,
  spec_json     TEXT    NOT NULL,              -- the spec as given, canonical JSON
  spec_hash     TEXT    NOT NULL,
  model_version TEXT    NOT NULL,
  n_points      INTEGER NOT NULL CHECK (n_points >= 0),
  chunk_size    INTEGER NOT NULL CHECK (chunk_size >= 1),  -- calibrated once; a resume never moves chunk boundaries
  created_at    INTEGER NOT NULL,
  updated_at    INTEGER NOT NULL               -- last time a result of this sweep was written
);

CREATE TABLE points (
  sweep_id    TEXT    NOT NULL REFERENCES sweeps (sweep_id) ON DELETE CASCADE,
  point_id    TEXT    NOT NULL,                -- hash of the resolved model input plus model version
  point_index INTEGER NOT NULL CHECK (point_index >= 0),
  PRIMARY KEY (sweep_id, point_id)
);
CREATE INDEX points_by_index ON points (sweep_id, point_index);

-- One row per point that has an outcome. Deterministic outputs (status, scalar columns, steps) are apart from
-- timing and provenance (wall_ms, worker_host, finished_at), which differ between identical runs.
CREATE TABLE results (
  sweep_id       TEXT    NOT NULL,
  point_id       TEXT    NOT NULL,
  point_index    INTEGER NOT NULL CHECK (point_index >= 0),  -- = points.point_index, kept here for the index below
  status         TEXT    NOT NULL,             -- a model status (ok, step_limit, ...) or infrastructure_error
  status_reason  TEXT,
  model_version  TEXT,                         -- as reported by the model; NULL for infrastructure errors
  steps          INTEGER,
  rejected_steps INTEGER,
  wall_ms        REAL,
  worker_host    TEXT    NOT NULL,
  finished_at    INTEGER NOT NULL,
  PRIMARY KEY (sweep_id, point_id),
  FOREIGN KEY (sweep_id, point_id) REFERENCES points (sweep_id, point_id) ON DELETE CASCADE
);
-- Covers what resume and status ask of a running sweep (points with a result, counts by status, finish
-- times) without touching the wide result rows; appends cheaply, as point indexes mostly grow during a run.
CREATE INDEX results_progress ON results (sweep_id, status, point_index, finished_at);

CREATE TABLE checkpoints (
  sweep_id TEXT NOT NULL,
  point_id TEXT NOT NULL,
  t_myr    REAL NOT NULL,
  PRIMARY KEY (sweep_id, point_id, t_myr),
  FOREIGN KEY (sweep_id, point_id) REFERENCES results (sweep_id, point_id) ON DELETE CASCADE
);

-- The compact time series: data holds n_samples rows of the listed columns as float32 little-endian,
-- row-major, exactly the bytes the model produced.
CREATE TABLE series (
  sweep_id  TEXT    NOT NULL,
  point_id  TEXT    NOT NULL,
  columns   TEXT    NOT NULL,                  -- JSON array of column names
  n_samples INTEGER NOT NULL CHECK (n_samples >= 0),
  data      BLOB    NOT NULL,
  PRIMARY KEY (sweep_id, point_id),
  FOREIGN KEY (sweep_id, point_id) REFERENCES results (sweep_id, point_id) ON DELETE CASCADE
);

-- Who is running a sweep on this database. scope is '*' for the whole database or a sweep_id.
CREATE TABLE locks (
  scope        TEXT    NOT NULL PRIMARY KEY,
  host         TEXT    NOT NULL,
  pid          INTEGER NOT NULL,
  started_at   INTEGER NOT NULL,
  heartbeat_at INTEGER NOT NULL
);
