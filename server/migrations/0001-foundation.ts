import type { QueryInterface } from 'sequelize'

// The foundation schema. Evidence tables (inspections, findings, photos, inspection_photos,
// activity_log) refuse UPDATE and DELETE in the database itself: a correction is a new row.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    CREATE TABLE workspaces (
      id serial PRIMARY KEY,
      name text NOT NULL,
      contact_phone text,
      contact_email text,
      address text,
      licence_number text,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE clients (
      id serial PRIMARY KEY,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      name text NOT NULL,
      contact_name text,
      report_email text NOT NULL,
      phone text,
      reinspect_interval_months integer NOT NULL DEFAULT 12 CHECK (reinspect_interval_months BETWEEN 1 AND 120),
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (workspace_id, name)
    );
    CREATE INDEX clients_workspace ON clients (workspace_id);

    CREATE TABLE users (
      id serial PRIMARY KEY,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      client_id integer REFERENCES clients(id),
      email text NOT NULL,
      name text NOT NULL,
      role text NOT NULL CHECK (role IN ('admin','officer','installer','manager')),
      password_hash text,
      active boolean NOT NULL DEFAULT true,
      last_sign_in_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      CHECK ((role = 'manager') = (client_id IS NOT NULL))
    );
    CREATE UNIQUE INDEX users_email ON users (lower(email));

    -- One row per signed-in device, so signing out (or a password reset) really ends a session.
    CREATE TABLE user_sessions (
      id text PRIMARY KEY,
      user_id integer NOT NULL REFERENCES users(id),
      created_at timestamptz NOT NULL DEFAULT now(),
      last_seen_at timestamptz NOT NULL DEFAULT now(),
      revoked_at timestamptz
    );
    CREATE INDEX user_sessions_user ON user_sessions (user_id);

    CREATE TABLE account_tokens (
      id serial PRIMARY KEY,
      user_id integer NOT NULL REFERENCES users(id),
      purpose text NOT NULL CHECK (purpose IN ('invite','reset')),
      token_hash text NOT NULL UNIQUE,
      expires_at timestamptz NOT NULL,
      used_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now()
    );

    CREATE TABLE sign_in_attempts (
      id bigserial PRIMARY KEY,
      key text NOT NULL,
      succeeded boolean NOT NULL,
      attempted_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX sign_in_attempts_key ON sign_in_attempts (key, attempted_at);

    CREATE TABLE sites (
      id serial PRIMARY KEY,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      client_id integer NOT NULL REFERENCES clients(id),
      ref text NOT NULL,
      name text NOT NULL,
      address text NOT NULL,
      jurisdiction text NOT NULL CHECK (jurisdiction IN ('AU','CA','US','EU')),
      premises text NOT NULL,
      notes text,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (workspace_id, ref)
    );
    CREATE INDEX sites_client ON sites (client_id);

    CREATE TABLE site_assignments (
      site_id integer NOT NULL REFERENCES sites(id),
      user_id integer NOT NULL REFERENCES users(id),
      assigned_on date NOT NULL DEFAULT current_date,
      PRIMARY KEY (site_id, user_id)
    );

    CREATE TABLE units (
      id serial PRIMARY KEY,
      site_id integer NOT NULL REFERENCES sites(id),
      ref text NOT NULL,
      name text,
      floor text,
      notes text,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (site_id, ref)
    );

    CREATE TABLE openings (
      id serial PRIMARY KEY,
      site_id integer NOT NULL REFERENCES sites(id),
      unit_id integer NOT NULL REFERENCES units(id),
      ref text NOT NULL,
      room text NOT NULL,
      kind text NOT NULL DEFAULT 'window' CHECK (kind IN ('window','door','other')),
      childrens_room boolean NOT NULL DEFAULT false,
      recess_width_mm integer CHECK (recess_width_mm > 0),
      recess_height_mm integer CHECK (recess_height_mm > 0),
      notes text,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (unit_id, ref)
    );
    CREATE INDEX openings_site ON openings (site_id);

    CREATE TABLE coverings (
      id serial PRIMARY KEY,
      site_id integer NOT NULL REFERENCES sites(id),
      opening_id integer NOT NULL REFERENCES openings(id),
      ref text NOT NULL,
      product_type text NOT NULL,
      control text NOT NULL,
      made_to text,
      mount text CHECK (mount IN ('inside','outside')),
      fixing text CHECK (fixing IN ('top','face')),
      control_side text CHECK (control_side IN ('left','right','centre')),
      width_mm integer CHECK (width_mm > 0),
      drop_mm integer CHECK (drop_mm > 0),
      maker_model text,
      manufactured_on text,
      installed_on date,
      status text NOT NULL DEFAULT 'in_place' CHECK (status IN ('in_place','removed')),
      last_inspection_id integer,
      last_verdict text,
      last_inspected_at timestamptz,
      created_at timestamptz NOT NULL DEFAULT now(),
      updated_at timestamptz NOT NULL DEFAULT now(),
      UNIQUE (site_id, ref)
    );
    CREATE INDEX coverings_opening ON coverings (opening_id);
    CREATE INDEX coverings_site_verdict ON coverings (site_id, last_verdict);

    CREATE TABLE inspections (
      id serial PRIMARY KEY,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      site_id integer NOT NULL REFERENCES sites(id),
      covering_id integer NOT NULL REFERENCES coverings(id),
      kind text NOT NULL CHECK (kind IN ('fitting','audit','import','correction')),
      inspected_at timestamptz NOT NULL,
      inspector_id integer REFERENCES users(id),
      record jsonb NOT NULL,
      rules_version text NOT NULL,
      verdict text NOT NULL CHECK (verdict IN ('compliant','non_compliant','incomplete','not_applicable')),
      notes text,
      corrects_id integer REFERENCES inspections(id),
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX inspections_covering ON inspections (covering_id, inspected_at DESC);
    CREATE INDEX inspections_site ON inspections (site_id);
    ALTER TABLE coverings ADD CONSTRAINT coverings_last_inspection FOREIGN KEY (last_inspection_id) REFERENCES inspections(id);

    CREATE TABLE findings (
      id serial PRIMARY KEY,
      inspection_id integer NOT NULL REFERENCES inspections(id),
      clause text NOT NULL,
      verdict text NOT NULL CHECK (verdict IN ('pass','fail','missing','not_applicable','advice')),
      measured text,
      limit_value text,
      unit text,
      field text,
      source text NOT NULL,
      basis text NOT NULL,
      message text NOT NULL,
      fix text
    );
    CREATE INDEX findings_inspection ON findings (inspection_id);

    CREATE TABLE photos (
      id serial PRIMARY KEY,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      site_id integer NOT NULL REFERENCES sites(id),
      covering_id integer NOT NULL REFERENCES coverings(id),
      kind text NOT NULL CHECK (kind IN ('whole','tension_device','cleat','labels','defect')),
      object_key text NOT NULL UNIQUE,
      thumb_key text,
      content_type text NOT NULL,
      size_bytes integer NOT NULL CHECK (size_bytes > 0),
      sha256 text NOT NULL,
      captured_at timestamptz,
      uploaded_by integer NOT NULL REFERENCES users(id),
      created_at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX photos_covering ON photos (covering_id);

    CREATE TABLE inspection_photos (
      inspection_id integer NOT NULL REFERENCES inspections(id),
      photo_id integer NOT NULL REFERENCES photos(id),
      PRIMARY KEY (inspection_id, photo_id)
    );

    CREATE TABLE activity_log (
      id bigserial PRIMARY KEY,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      user_id integer REFERENCES users(id),
      action text NOT NULL,
      entity text NOT NULL,
      entity_id integer,
      detail jsonb NOT NULL DEFAULT '{}'::jsonb,
      at timestamptz NOT NULL DEFAULT now()
    );
    CREATE INDEX activity_log_workspace ON activity_log (workspace_id, at DESC);

    CREATE FUNCTION tautline_refuse_change() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      RAISE EXCEPTION '% rows are evidence and cannot be changed (%); record a correction instead', TG_TABLE_NAME, TG_OP
        USING ERRCODE = 'restrict_violation';
    END $$;

    CREATE TRIGGER inspections_immutable BEFORE UPDATE OR DELETE ON inspections FOR EACH ROW EXECUTE FUNCTION tautline_refuse_change();
    CREATE TRIGGER findings_immutable BEFORE UPDATE OR DELETE ON findings FOR EACH ROW EXECUTE FUNCTION tautline_refuse_change();
    CREATE TRIGGER photos_immutable BEFORE UPDATE OR DELETE ON photos FOR EACH ROW EXECUTE FUNCTION tautline_refuse_change();
    CREATE TRIGGER inspection_photos_immutable BEFORE UPDATE OR DELETE ON inspection_photos FOR EACH ROW EXECUTE FUNCTION tautline_refuse_change();
    CREATE TRIGGER activity_log_immutable BEFORE UPDATE OR DELETE ON activity_log FOR EACH ROW EXECUTE FUNCTION tautline_refuse_change();
    CREATE TRIGGER inspections_no_truncate BEFORE TRUNCATE ON inspections EXECUTE FUNCTION tautline_refuse_change();
    CREATE TRIGGER findings_no_truncate BEFORE TRUNCATE ON findings EXECUTE FUNCTION tautline_refuse_change();
    CREATE TRIGGER photos_no_truncate BEFORE TRUNCATE ON photos EXECUTE FUNCTION tautline_refuse_change();
  `)
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    DROP TABLE IF EXISTS activity_log, inspection_photos, photos, findings CASCADE;
    ALTER TABLE IF EXISTS coverings DROP CONSTRAINT IF EXISTS coverings_last_inspection;
    DROP TABLE IF EXISTS inspections, coverings, openings, units, site_assignments, sites,
      sign_in_attempts, account_tokens, user_sessions, users, clients, workspaces CASCADE;
    DROP FUNCTION IF EXISTS tautline_refuse_change();
  `)
}
