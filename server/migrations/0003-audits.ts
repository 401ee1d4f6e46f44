import type { QueryInterface } from 'sequelize'

// Site audits walked covering by covering, remedies (the fixes a failure calls for, tracked to
// closure), and the record of reports sent to clients.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    CREATE TABLE audits (
      id serial PRIMARY KEY,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      site_id integer NOT NULL REFERENCES sites(id),
      status text NOT NULL DEFAULT 'open' CHECK (status IN ('open','closed')),
      opened_by integer NOT NULL REFERENCES users(id),
      opened_at timestamptz NOT NULL DEFAULT now(),
      closed_by integer REFERENCES users(id),
      closed_by_name text,
      closed_at timestamptz,
      summary jsonb,
      notes text,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE UNIQUE INDEX audits_one_open_per_site ON audits (site_id) WHERE status = 'open';

    CREATE TABLE audit_items (
      audit_id integer NOT NULL REFERENCES audits(id),
      covering_id integer NOT NULL REFERENCES coverings(id),
      status text NOT NULL DEFAULT 'pending' CHECK (status IN ('pending','measured','confirmed','not_accessible')),
      inspection_id integer REFERENCES inspections(id),
      reason text,
      updated_by integer REFERENCES users(id),
      updated_at timestamptz NOT NULL DEFAULT now(),
      PRIMARY KEY (audit_id, covering_id),
      CHECK (status <> 'not_accessible' OR reason IS NOT NULL)
    );

    ALTER TABLE inspections ADD COLUMN audit_id integer REFERENCES audits(id);
    CREATE INDEX inspections_audit ON inspections (audit_id) WHERE audit_id IS NOT NULL;

    CREATE TABLE fixes (
      id serial PRIMARY KEY,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      site_id integer NOT NULL REFERENCES sites(id),
      covering_id integer NOT NULL REFERENCES coverings(id),
      clause text NOT NULL,
      raised_by_inspection_id integer NOT NULL REFERENCES inspections(id),
      message text NOT NULL,
      fix text,
      source text NOT NULL,
      priority integer NOT NULL CHECK (priority BETWEEN 1 AND 4),
      status text NOT NULL DEFAULT 'open' CHECK (status IN ('open','closed')),
      assignee_id integer REFERENCES users(id),
      due_on date NOT NULL,
      closed_by_inspection_id integer REFERENCES inspections(id),
      closed_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      CHECK ((status = 'closed') = (closed_by_inspection_id IS NOT NULL))
    );
    CREATE UNIQUE INDEX fixes_one_open_per_clause ON fixes (covering_id, clause) WHERE status = 'open';
    CREATE INDEX fixes_site_status ON fixes (site_id, status, due_on);

    CREATE TABLE report_dispatches (
      id serial PRIMARY KEY,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      site_id integer NOT NULL REFERENCES sites(id),
      sent_by integer NOT NULL REFERENCES users(id),
      sent_to text NOT NULL,
      subject text NOT NULL,
      file_name text NOT NULL,
      size_bytes integer NOT NULL,
      sha256 text NOT NULL,
      status text NOT NULL DEFAULT 'queued' CHECK (status IN ('queued','sent','failed')),
      attempts integer NOT NULL DEFAULT 0,
      last_error text,
      message_id text,
      created_at timestamptz NOT NULL DEFAULT now(),
      sent_at timestamptz
    );
    CREATE INDEX report_dispatches_site ON report_dispatches (site_id, created_at DESC);
  `)
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    DROP TABLE IF EXISTS report_dispatches, fixes, audit_items CASCADE;
    ALTER TABLE inspections DROP COLUMN IF EXISTS audit_id;
    DROP TABLE IF EXISTS audits CASCADE;
  `)
}
