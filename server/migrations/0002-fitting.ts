import type { QueryInterface } from 'sequelize'

// Fitting record: an idempotency key so a draft sent twice from a phone lands once,
// and the original file name of a photo for the person reading the evidence later.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    ALTER TABLE inspections ADD COLUMN client_key text;
    CREATE UNIQUE INDEX inspections_client_key ON inspections (covering_id, client_key) WHERE client_key IS NOT NULL;
    ALTER TABLE photos ADD COLUMN file_name text;
    ALTER TABLE photos ADD COLUMN width_px integer;
    ALTER TABLE photos ADD COLUMN height_px integer;
  `)
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    DROP INDEX IF EXISTS inspections_client_key;
    ALTER TABLE inspections DROP COLUMN IF EXISTS client_key;
    ALTER TABLE photos DROP COLUMN IF EXISTS file_name, DROP COLUMN IF EXISTS width_px, DROP COLUMN IF EXISTS height_px;
  `)
}
