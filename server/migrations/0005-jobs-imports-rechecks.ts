import type { QueryInterface } from 'sequelize'

// Background jobs (imports, re-checks, exports) as the pages see them; pg-boss, in its own schema,
// only hands them out to server processes. An import keeps its file in S3 and its bad rows here;
// a re-check stores one result per covering, pointing at the inspection whose measurements it used.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    CREATE TABLE jobs (
      id serial PRIMARY KEY,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      client_id integer REFERENCES clients(id),
      site_id integer REFERENCES sites(id),
      kind text NOT NULL CHECK (kind IN ('import','recheck','export')),
      status text NOT NULL DEFAULT 'queued' CHECK (status IN ('queued','running','succeeded','failed','cancelled')),
      params jsonb NOT NULL DEFAULT '{}'::jsonb,
      progress_done integer NOT NULL DEFAULT 0 CHECK (progress_done >= 0),
      progress_total integer CHECK (progress_total >= 0),
      counts jsonb NOT NULL DEFAULT '{}'::jsonb,
      error text,
      cancel_requested boolean NOT NULL DEFAULT false,
      attempts integer NOT NULL DEFAULT 0,
      queue_job_id text,
      created_by integer NOT NULL REFERENCES users(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      started_at timestamptz,
      heartbeat_at timestamptz,
      finished_at timestamptz,
      updated_at timestamptz NOT NULL DEFAULT now(),
      CHECK ((status IN ('succeeded','failed','cancelled')) = (finished_at IS NOT NULL))
    );
    CREATE INDEX jobs_workspace_kind ON jobs (workspace_id, kind, created_at DESC);
    CREATE INDEX jobs_client_kind ON jobs (client_id, kind, created_at DESC);
    CREATE INDEX jobs_live ON jobs (status, heartbeat_at) WHERE status IN ('queued','running');

    CREATE TABLE imports (
      job_id integer PRIMARY KEY REFERENCES jobs(id),
      mode text NOT NULL CHECK (mode IN ('dry_run','commit')),
      skip_invalid boolean NOT NULL DEFAULT false,
      dry_run_id integer REFERENCES imports(job_id),
      file_name text NOT NULL,
      object_key text NOT NULL,
      size_bytes integer NOT NULL CHECK (size_bytes > 0),
      sha256 text NOT NULL,
      row_count integer NOT NULL CHECK (row_count >= 0),
      bad_row_count integer NOT NULL DEFAULT 0,
      error_count integer NOT NULL DEFAULT 0
    );

    -- The first 1,000 problems of an import, by row; imports.error_count holds the full count.
    CREATE TABLE import_row_errors (
      id bigserial PRIMARY KEY,
      job_id integer NOT NULL REFERENCES imports(job_id),
      row_number integer NOT NULL,
      column_name text NOT NULL,
      message text NOT NULL
    );
    CREATE INDEX import_row_errors_job ON import_row_errors (job_id, row_number);

    ALTER TABLE inspections ADD COLUMN import_id integer REFERENCES imports(job_id);
    ALTER TABLE inspections ADD COLUMN source_row integer;
    ALTER TABLE inspections ADD CONSTRAINT inspections_import_source
      CHECK (kind <> 'import' OR (import_id IS NOT NULL AND source_row IS NOT NULL));
    CREATE INDEX inspections_import ON inspections (import_id) WHERE import_id IS NOT NULL;
    -- An import writes a new covering already pointing at the inspection it writes next; the key is checked at commit.
    ALTER TABLE coverings ALTER CONSTRAINT coverings_last_inspection DEFERRABLE INITIALLY IMMEDIATE;

    CREATE TABLE check_results (
      id bigserial PRIMARY KEY,
      job_id integer NOT NULL REFERENCES jobs(id),
      site_id integer NOT NULL REFERENCES sites(id),
      covering_id integer NOT NULL REFERENCES coverings(id),
      inspection_id integer NOT NULL REFERENCES inspections(id),
      rules_version text NOT NULL,
      verdict text NOT NULL CHECK (verdict IN ('compliant','non_compliant','incomplete','not_applicable')),
      previous_verdict text,
      change text NOT NULL CHECK (change IN ('newly_failing','newly_passing','now_incomplete','other','unchanged')),
      failed_clauses text[] NOT NULL DEFAULT '{}',
      missing_fields text[] NOT NULL DEFAULT '{}',
      checked_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX check_results_job ON check_results (job_id, change, covering_id);
    CREATE INDEX check_results_covering ON check_results (covering_id, checked_at DESC);
    CREATE TRIGGER check_results_immutable BEFORE UPDATE OR DELETE ON check_results FOR EACH ROW EXECUTE FUNCTION tautline_refuse_change();
    CREATE TRIGGER check_results_no_truncate BEFORE TRUNCATE ON check_results EXECUTE FUNCTION tautline_refuse_change();
  `)
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    DROP TABLE IF EXISTS check_results, import_row_errors CASCADE;
    ALTER TABLE inspections DROP CONSTRAINT IF EXISTS inspections_import_source;
    DROP INDEX IF EXISTS inspections_import;
    ALTER TABLE coverings ALTER CONSTRAINT coverings_last_inspection NOT DEFERRABLE;
    ALTER TABLE inspections DROP COLUMN IF EXISTS import_id, DROP COLUMN IF EXISTS source_row;
    DROP TABLE IF EXISTS imports, jobs CASCADE;
  `)
}
