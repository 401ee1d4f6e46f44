import type { QueryInterface } from 'sequelize'

// A sent report keeps its PDF in S3 (object_key), so a retry sends the very file that was recorded and the
// client's copy can be found again. next_attempt_at spaces retries out and lets several processes share them.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    ALTER TABLE report_dispatches ADD COLUMN object_key text;
    ALTER TABLE report_dispatches ADD COLUMN next_attempt_at timestamptz NOT NULL DEFAULT now();
    CREATE INDEX report_dispatches_due ON report_dispatches (next_attempt_at) WHERE status = 'queued';
  `)
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    DROP INDEX IF EXISTS report_dispatches_due;
    ALTER TABLE report_dispatches DROP COLUMN IF EXISTS next_attempt_at, DROP COLUMN IF EXISTS object_key;
  `)
}
