-- The review loop's tables (D1 / SQLite). Applied in order by
-- `npx wrangler d1 migrations apply sluice-reviews --local` (or --remote) and by the tests.
-- Times are milliseconds since the Unix epoch (UTC); an hour is floor(ms / 3600000).

-- One row per decision that asked for a person ("review"), from /v1/moderate, /v1/classify
-- and the e-mail handler. `text` is NULL unless REVIEW_STORE_TEXT is on; `text_hash` is an
-- HMAC-SHA256 of the text under REVIEW_HASH_KEY (NULL without a key).
CREATE TABLE review_items (
  id INTEGER PRIMARY KEY AUTOINCREMENT,
  created_at INTEGER NOT NULL,
  source TEXT NOT NULL,            -- moderate | classify | email
  model_version TEXT NOT NULL,
  text TEXT,
  text_hash TEXT,
  label TEXT NOT NULL,             -- the model's decision label
  score REAL,                      -- NULL when the score was not finite (the decision failed closed)
  action TEXT NOT NULL,            -- always review today; kept so the row explains itself
  scores TEXT NOT NULL,            -- JSON [{ "label", "score" }], best first
  reasons TEXT NOT NULL,           -- JSON array of strings
  status TEXT NOT NULL DEFAULT 'pending',  -- pending | decided | skipped
  lease_id TEXT,
  lease_until INTEGER,
  decided_label TEXT,
  decided_at INTEGER
);
CREATE INDEX review_items_by_status ON review_items (status, id);
CREATE INDEX review_items_by_age ON review_items (created_at);

-- Per-hour traffic counts: kind = action | label | score (key = the score bucket's lower edge, "0.0"…"0.9").
CREATE TABLE traffic_hourly (
  hour INTEGER NOT NULL,
  model_version TEXT NOT NULL,
  kind TEXT NOT NULL,
  key TEXT NOT NULL,
  count INTEGER NOT NULL,
  PRIMARY KEY (hour, model_version, kind, key)
);

-- Per-hour shadow counts: how the candidate's decision compares with the live one's.
CREATE TABLE shadow_hourly (
  hour INTEGER NOT NULL,
  live_version TEXT NOT NULL,
  candidate_version TEXT NOT NULL,
  live_label TEXT NOT NULL,
  candidate_label TEXT NOT NULL,
  live_action TEXT NOT NULL,
  candidate_action TEXT NOT NULL,
  count INTEGER NOT NULL,
  PRIMARY KEY (hour, live_version, candidate_version, live_label, candidate_label, live_action, candidate_action)
);

-- A few flipped texts per hour, only when REVIEW_STORE_TEXT is on.
CREATE TABLE shadow_samples (
  id INTEGER PRIMARY KEY AUTOINCREMENT,
  created_at INTEGER NOT NULL,
  hour INTEGER NOT NULL,
  live_version TEXT NOT NULL,
  candidate_version TEXT NOT NULL,
  text TEXT NOT NULL,
  live_label TEXT NOT NULL,
  live_score REAL,
  live_action TEXT NOT NULL,
  candidate_label TEXT NOT NULL,
  candidate_score REAL,
  candidate_action TEXT NOT NULL
);
CREATE INDEX shadow_samples_by_hour ON shadow_samples (hour);
CREATE INDEX shadow_samples_by_age ON shadow_samples (created_at);
