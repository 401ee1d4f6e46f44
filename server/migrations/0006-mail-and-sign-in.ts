import type { QueryInterface } from 'sequelize'

// Every message the app sends, recorded with the workspace (and person) that caused it: the Mailbox lists this
// record, never the mail fake's folder, so one workspace never reads another's mail. And one counter row per
// rate-limited key (sign-in, reset requests, audit requests), bumped atomically before the work it guards.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    CREATE TABLE sent_mail (
      id bigserial PRIMARY KEY,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      caused_by integer REFERENCES users(id),
      kind text NOT NULL CHECK (kind IN ('invite','reset','report','audit_request')),
      recipients text[] NOT NULL,
      reply_to text,
      subject text NOT NULL,
      body_text text,
      attachments jsonb NOT NULL DEFAULT '[]'::jsonb,
      report_dispatch_id integer UNIQUE REFERENCES report_dispatches(id),
      status text NOT NULL CHECK (status IN ('sent','retrying','failed')),
      error text,
      attempts integer NOT NULL DEFAULT 1,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX sent_mail_workspace ON sent_mail (workspace_id, created_at DESC, id DESC);

    CREATE TABLE rate_limits (
      key text PRIMARY KEY,
      hits integer NOT NULL CHECK (hits >= 0),
      window_started_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX rate_limits_window ON rate_limits (window_started_at);

    DROP TABLE sign_in_attempts;
  `)
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    CREATE TABLE sign_in_attempts (
      id bigserial PRIMARY KEY,
      key text NOT NULL,
      succeeded boolean NOT NULL,
      attempted_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX sign_in_attempts_key ON sign_in_attempts (key, attempted_at);
    DROP TABLE IF EXISTS rate_limits;
    DROP TABLE IF EXISTS sent_mail;
  `)
}
