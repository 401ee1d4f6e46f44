import type { QueryInterface } from 'sequelize'

// What keeps the register's proof from drifting:
// - a sign-off remembers a hash of its canonical body, so its clientKey replays only that very request;
// - an audit confirmation names the inspection whose measurements it confirms (who measured stays known);
// - editing a field the rules read marks the covering as changed since its last inspection;
// - a removal is a recorded act (covering_removals, insert-only), and can close remedies.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    ALTER TABLE inspections ADD COLUMN body_sha256 text;
    ALTER TABLE inspections ADD COLUMN confirms_id integer REFERENCES inspections(id);

    ALTER TABLE coverings ADD COLUMN changed_since_inspection boolean NOT NULL DEFAULT false;
    ALTER TABLE coverings ADD COLUMN changed_fields text[] NOT NULL DEFAULT '{}';
    ALTER TABLE coverings ADD COLUMN changed_at timestamptz;

    CREATE TABLE covering_removals (
      id serial PRIMARY KEY,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      covering_id integer NOT NULL REFERENCES coverings(id),
      removed_by integer NOT NULL REFERENCES users(id),
      removed_at timestamptz NOT NULL DEFAULT now(),
      reason text NOT NULL CHECK (length(reason) > 0),
      photo_id integer REFERENCES photos(id),
      replaced_by integer REFERENCES coverings(id)
    );
    CREATE UNIQUE INDEX covering_removals_one_per_covering ON covering_removals (covering_id);
    CREATE TRIGGER covering_removals_immutable BEFORE UPDATE OR DELETE ON covering_removals FOR EACH ROW EXECUTE FUNCTION tautline_refuse_change();
    CREATE TRIGGER covering_removals_no_truncate BEFORE TRUNCATE ON covering_removals EXECUTE FUNCTION tautline_refuse_change();

    ALTER TABLE fixes ADD COLUMN closed_by_removal_id integer REFERENCES covering_removals(id);
    DO $$
    DECLARE c text;
    BEGIN
      FOR c IN SELECT conname FROM pg_constraint WHERE conrelid = 'fixes'::regclass AND contype = 'c'
        AND pg_get_constraintdef(oid) LIKE '%closed_by_inspection_id IS NOT NULL%' LOOP
        EXECUTE format('ALTER TABLE fixes DROP CONSTRAINT %I', c);
      END LOOP;
    END $$;
    ALTER TABLE fixes ADD CONSTRAINT fixes_closed_by_evidence
      CHECK ((status = 'closed') = (closed_by_inspection_id IS NOT NULL OR closed_by_removal_id IS NOT NULL));
  `)
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    ALTER TABLE fixes DROP CONSTRAINT IF EXISTS fixes_closed_by_evidence;
    ALTER TABLE fixes DROP COLUMN IF EXISTS closed_by_removal_id;
    ALTER TABLE fixes ADD CONSTRAINT fixes_check CHECK ((status = 'closed') = (closed_by_inspection_id IS NOT NULL)) NOT VALID;
    DROP TABLE IF EXISTS covering_removals;
    ALTER TABLE coverings DROP COLUMN IF EXISTS changed_since_inspection, DROP COLUMN IF EXISTS changed_fields, DROP COLUMN IF EXISTS changed_at;
    ALTER TABLE inspections DROP COLUMN IF EXISTS confirms_id, DROP COLUMN IF EXISTS body_sha256;
  `)
}
