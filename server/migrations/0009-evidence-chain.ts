import { QueryTypes } from 'sequelize'
import type { QueryInterface } from 'sequelize'

// Tamper evidence for the evidence tables. Every inserted row gets a SHA-256 of its content, computed by the
// database itself (so Sequelize, raw SQL, COPY and anything else that inserts are all covered), and those
// hashes are chained per table per workspace in evidence_chain_blocks: one block per INSERT/COPY statement
// and workspace, holding its rows' keys and hashes in the order the statement wrote them, each block hashed over
// the one before it.
//
// The hashing happens in a statement-level AFTER INSERT trigger, without any lock. The chaining (taking the
// next place in the chain) happens in a deferred constraint trigger, at commit: it locks the chains' head rows
// in one fixed order, links the transaction's blocks and commits, so the lock lasts only that moment. A long
// import therefore never holds a chain while it runs (a sign-off in the same workspace never waits for it),
// and two transactions can never deadlock over chains.
//
// A row's canonical content is its record text, row::text, with trailing empty (null) fields dropped: columns in
// table order, quoted where needed, so unambiguous. The functions pin every setting the text depends on (time zone,
// date style, float digits, bytea and interval output), so any session gets the same text; and dropping trailing
// nulls means a later migration that adds a nullable column to an evidence table leaves every hash as it was.
// (The record text costs a quarter of to_jsonb or row_to_json per row, which matters for imports and re-checks.)
// tautline_evidence_verify() recomputes everything and reports the first row per table that no longer matches.

// The evidence tables, in report order, and where a table without its own workspace_id finds it (alias p).
// A row's key is its primary key (inspection_photos: inspection_id/photo_id), read from the catalogue below.
const TABLES: Array<{ table: string, workspace?: string, join?: string }> = [
  { table: 'inspections' },
  { table: 'findings', workspace: 'p.workspace_id', join: 'JOIN inspections p ON p.id = r.inspection_id' },
  { table: 'photos' },
  { table: 'inspection_photos', workspace: 'p.workspace_id', join: 'JOIN inspections p ON p.id = r.inspection_id' },
  { table: 'check_results', workspace: 'p.workspace_id', join: 'JOIN sites p ON p.id = r.site_id' },
  { table: 'covering_removals', workspace: 'p.workspace_id', join: 'JOIN coverings pc ON pc.id = r.covering_id JOIN sites p ON p.id = pc.site_id' },
  { table: 'activity_log' },
]

// Every setting a row's text depends on, pinned on each function that renders rows.
const PINNED = `SET timezone = 'UTC' SET datestyle = 'ISO, YMD' SET intervalstyle = 'postgres' SET extra_float_digits = 1 SET bytea_output = 'hex'`
// A row's canonical text: the record with trailing empty fields dropped. A field that ends in ',' or ')' is always
// quoted, so only empty fields and the closing parenthesis are trimmed.
const ROW_TEXT = `rtrim(r::text, ',)') || ')'`

const q = (s: string) => `'${s.replace(/'/g, '\'\'')}'`

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    -- How each evidence table is chained: SQL fragments over the row alias r (and the parent alias p), written
    -- only by migrations. position orders the verify report.
    CREATE TABLE evidence_chain_tables (
      table_name text PRIMARY KEY,
      position integer NOT NULL UNIQUE,
      key_sql text NOT NULL,
      order_sql text NOT NULL,
      workspace_sql text NOT NULL,
      join_sql text NOT NULL DEFAULT ''
    );

    -- The last sealed block of each chain; its row is what a sealing transaction locks.
    CREATE TABLE evidence_chain_heads (
      table_name text NOT NULL,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      seq bigint NOT NULL DEFAULT 0,
      hash text NOT NULL DEFAULT '',
      PRIMARY KEY (table_name, workspace_id)
    );

    -- One block per statement and workspace: the rows' keys and SHA-256s, in the statement's order. seq, prev_hash and hash
    -- are filled in when the inserting transaction commits; after that a block never changes.
    CREATE TABLE evidence_chain_blocks (
      id bigserial PRIMARY KEY,
      table_name text NOT NULL,
      workspace_id integer NOT NULL REFERENCES workspaces(id),
      seq bigint,
      prev_hash text,
      hash text,
      row_keys text[] NOT NULL,
      row_hashes bytea[] NOT NULL,
      created_at timestamptz NOT NULL DEFAULT now(),
      sealed_at timestamptz,
      UNIQUE (table_name, workspace_id, seq),
      CHECK (cardinality(row_keys) > 0 AND cardinality(row_keys) = cardinality(row_hashes)),
      CHECK ((seq IS NULL) = (hash IS NULL))
    );
    -- Hashes do not compress: stored out of line as they are.
    ALTER TABLE evidence_chain_blocks ALTER COLUMN row_hashes SET STORAGE EXTERNAL;
    CREATE INDEX evidence_chain_blocks_unsealed ON evidence_chain_blocks (table_name, workspace_id, id) WHERE seq IS NULL;

    -- A row's SHA-256: its table and its canonical content (see above), given as ${ROW_TEXT} with the settings pinned.
    CREATE FUNCTION tautline_row_hash(tbl text, content text) RETURNS bytea LANGUAGE sql IMMUTABLE PARALLEL SAFE AS $$
      SELECT sha256(convert_to(tbl || E'\\n' || content, 'UTF8'))
    $$;

    -- A block's hash: the previous block's hash, its place in the chain and every row's key and hash in order.
    CREATE FUNCTION tautline_block_hash(prev text, tbl text, ws integer, seq bigint, keys text[], hashes bytea[]) RETURNS text
    LANGUAGE sql IMMUTABLE PARALLEL SAFE AS $$
      SELECT encode(sha256(convert_to(concat_ws(E'\\n', prev, tbl, ws::text, seq::text,
        (SELECT string_agg(u.k || ' ' || encode(u.h, 'hex'), E'\\n' ORDER BY u.o) FROM unnest(keys, hashes) WITH ORDINALITY AS u(k, h, o))), 'UTF8')), 'hex')
    $$;

    -- The statement that hashes the rows one statement inserted (its transition table new_rows, or the whole
    -- table for the first chaining) and groups them into one unsealed block per workspace. Run it with the settings pinned.
    CREATE FUNCTION tautline_chain_rows_sql(tbl text, source text) RETURNS text LANGUAGE plpgsql STABLE AS $$
    DECLARE
      c evidence_chain_tables;
    BEGIN
      SELECT * INTO c FROM evidence_chain_tables WHERE table_name = tbl;
      IF NOT FOUND THEN RAISE EXCEPTION 'no evidence chain is set up for %', tbl; END IF;
      -- Both arrays are built in one pass over the same rows, so they stay aligned; the order is the statement's.
      RETURN format($q$
        INSERT INTO evidence_chain_blocks (table_name, workspace_id, row_keys, row_hashes)
        SELECT %1$L, %2$s, array_agg(%3$s), array_agg(tautline_row_hash(%1$L, ${ROW_TEXT}))
        FROM %4$s r %5$s
        GROUP BY 2 $q$, tbl, c.workspace_sql, c.key_sql, source, c.join_sql);
    END $$;

    -- The transition table is visible only to the trigger function itself, so the statement runs here.
    CREATE FUNCTION tautline_chain_statement() RETURNS trigger LANGUAGE plpgsql
    ${PINNED} AS $$
    BEGIN
      EXECUTE tautline_chain_rows_sql(TG_TABLE_NAME, 'new_rows');
      RETURN NULL;
    END $$;

    CREATE FUNCTION tautline_chain_existing(tbl text) RETURNS void LANGUAGE plpgsql
    ${PINNED} AS $$
    BEGIN
      EXECUTE tautline_chain_rows_sql(tbl, format('(SELECT r.* FROM %I r ORDER BY %s)', tbl, (SELECT order_sql FROM evidence_chain_tables WHERE table_name = tbl)));
    END $$;

    -- At commit (deferred): link this transaction's blocks onto their chains. Head rows are locked in
    -- (table, workspace) order, so two committing transactions cannot deadlock over them.
    CREATE FUNCTION tautline_chain_seal() RETURNS trigger LANGUAGE plpgsql AS $$
    DECLARE
      ch record;
      b record;
      head evidence_chain_heads;
      next_hash text;
    BEGIN
      IF NOT EXISTS (SELECT 1 FROM evidence_chain_blocks WHERE id = NEW.id AND seq IS NULL) THEN RETURN NULL; END IF;
      FOR ch IN SELECT DISTINCT table_name, workspace_id FROM evidence_chain_blocks WHERE seq IS NULL ORDER BY 1, 2 LOOP
        INSERT INTO evidence_chain_heads (table_name, workspace_id) VALUES (ch.table_name, ch.workspace_id) ON CONFLICT DO NOTHING;
        SELECT * INTO head FROM evidence_chain_heads WHERE table_name = ch.table_name AND workspace_id = ch.workspace_id FOR UPDATE;
        FOR b IN SELECT id, row_keys, row_hashes FROM evidence_chain_blocks
                 WHERE seq IS NULL AND table_name = ch.table_name AND workspace_id = ch.workspace_id ORDER BY id LOOP
          next_hash := tautline_block_hash(head.hash, ch.table_name, ch.workspace_id, head.seq + 1, b.row_keys, b.row_hashes);
          UPDATE evidence_chain_blocks SET seq = head.seq + 1, prev_hash = head.hash, hash = next_hash, sealed_at = now() WHERE id = b.id;
          head.seq := head.seq + 1;
          head.hash := next_hash;
        END LOOP;
        UPDATE evidence_chain_heads SET seq = head.seq, hash = head.hash WHERE table_name = ch.table_name AND workspace_id = ch.workspace_id;
      END LOOP;
      RETURN NULL;
    END $$;
    CREATE CONSTRAINT TRIGGER evidence_chain_blocks_seal AFTER INSERT ON evidence_chain_blocks
      DEFERRABLE INITIALLY DEFERRED FOR EACH ROW EXECUTE FUNCTION tautline_chain_seal();

    -- A sealed block is history: only the sealing itself may fill in an unsealed one.
    CREATE FUNCTION tautline_chain_block_guard() RETURNS trigger LANGUAGE plpgsql AS $$
    BEGIN
      IF TG_OP = 'UPDATE' AND OLD.seq IS NULL AND NEW.row_keys = OLD.row_keys AND NEW.row_hashes = OLD.row_hashes
        AND NEW.table_name = OLD.table_name AND NEW.workspace_id = OLD.workspace_id THEN
        RETURN NEW;
      END IF;
      RAISE EXCEPTION 'evidence chain blocks cannot be changed (%)', TG_OP USING ERRCODE = 'restrict_violation';
    END $$;
    CREATE TRIGGER evidence_chain_blocks_immutable BEFORE UPDATE OR DELETE ON evidence_chain_blocks FOR EACH ROW EXECUTE FUNCTION tautline_chain_block_guard();
    CREATE TRIGGER evidence_chain_blocks_no_truncate BEFORE TRUNCATE ON evidence_chain_blocks EXECUTE FUNCTION tautline_refuse_change();
    CREATE TRIGGER evidence_chain_heads_no_delete BEFORE DELETE ON evidence_chain_heads FOR EACH ROW EXECUTE FUNCTION tautline_refuse_change();
    CREATE TRIGGER evidence_chain_heads_no_truncate BEFORE TRUNCATE ON evidence_chain_heads EXECUTE FUNCTION tautline_refuse_change();

    -- Recomputes every chain (or one workspace's) and, per table, reports the first row that no longer matches:
    -- its content changed, it is gone, it was never chained, or its block's link is broken.
    CREATE FUNCTION tautline_evidence_verify(only_workspace integer DEFAULT NULL)
    RETURNS TABLE (table_name text, rows_checked bigint, blocks bigint, problems bigint, workspace_id integer, row_key text, problem text)
    LANGUAGE plpgsql STABLE ${PINNED} AS $$
    DECLARE
      c evidence_chain_tables;
      b record;
      prev_ws integer;
      prev_seq bigint;
      prev_hash text;
      link_ws integer;
      link_key text;
      link_problem text;
      link_count bigint;
      row_ws integer;
      row_k text;
      row_problem text;
      row_count bigint;
      checked bigint;
      block_count bigint;
    BEGIN
      FOR c IN SELECT * FROM evidence_chain_tables t WHERE to_regclass(t.table_name) IS NOT NULL ORDER BY t.position LOOP
        -- The links: each workspace's blocks numbered 1, 2, … with each hash over the one before, ending at the head.
        link_ws := NULL; link_key := NULL; link_problem := NULL; link_count := 0; block_count := 0;
        prev_ws := NULL;
        FOR b IN
          SELECT bl.workspace_id AS ws, bl.seq, bl.prev_hash, bl.hash, bl.row_keys, bl.row_hashes, false AS is_head
          FROM evidence_chain_blocks bl
          WHERE bl.table_name = c.table_name AND (only_workspace IS NULL OR bl.workspace_id = only_workspace)
          UNION ALL
          SELECT h.workspace_id, h.seq, NULL, h.hash, NULL, NULL, true
          FROM evidence_chain_heads h
          WHERE h.table_name = c.table_name AND (only_workspace IS NULL OR h.workspace_id = only_workspace)
          ORDER BY 1, 2 NULLS LAST, 7
        LOOP
          IF prev_ws IS DISTINCT FROM b.ws THEN
            prev_ws := b.ws; prev_seq := 0; prev_hash := '';
          END IF;
          IF b.is_head THEN
            IF b.seq <> prev_seq OR b.hash <> prev_hash THEN
              link_count := link_count + 1;
              IF link_problem IS NULL THEN
                link_ws := b.ws; link_key := NULL;
                link_problem := format('the chain head (block %s) does not match its last block (%s): blocks are missing', b.seq, prev_seq);
              END IF;
            END IF;
            CONTINUE;
          END IF;
          block_count := block_count + 1;
          IF b.seq IS NULL THEN
            link_count := link_count + 1;
            IF link_problem IS NULL THEN
              link_ws := b.ws; link_key := b.row_keys[1]; link_problem := 'its block was committed without being sealed into the chain';
            END IF;
            CONTINUE;
          END IF;
          IF b.seq <> prev_seq + 1 OR b.prev_hash IS DISTINCT FROM prev_hash
             OR b.hash <> tautline_block_hash(prev_hash, c.table_name, b.ws, b.seq, b.row_keys, b.row_hashes) THEN
            link_count := link_count + 1;
            IF link_problem IS NULL THEN
              link_ws := b.ws; link_key := b.row_keys[1];
              link_problem := format('the chain link of its block (%s) does not match', b.seq);
            END IF;
          END IF;
          prev_seq := b.seq; prev_hash := b.hash;
        END LOOP;

        -- The rows: each one's hash recomputed from its content, against what its block recorded.
        EXECUTE format($q$
          WITH chained AS (
            SELECT bl.workspace_id AS ws, bl.seq, u.k, u.h, u.o
            FROM evidence_chain_blocks bl, unnest(bl.row_keys, bl.row_hashes) WITH ORDINALITY AS u(k, h, o)
            WHERE bl.table_name = %1$L AND ($1 IS NULL OR bl.workspace_id = $1)
          ), actual AS (
            SELECT %2$s AS ws, %3$s AS k, tautline_row_hash(%1$L, ${ROW_TEXT}) AS h
            FROM %1$I r %4$s
            WHERE $1 IS NULL OR %2$s = $1
          ), compared AS (
            SELECT coalesce(c.ws, a.ws) AS ws, c.seq, c.o, coalesce(c.k, a.k) AS k, (a.k IS NOT NULL) AS present,
              CASE WHEN a.k IS NULL THEN 'the row is gone'
                   WHEN c.k IS NULL THEN 'the row was never chained'
                   WHEN a.ws <> c.ws THEN 'the row moved to another workspace'
                   WHEN a.h <> c.h THEN 'the row''s content changed since it was recorded'
              END AS problem
            FROM chained c FULL JOIN actual a ON a.k = c.k
          )
          SELECT (SELECT count(*) FROM compared WHERE present), (SELECT count(*) FROM compared WHERE problem IS NOT NULL),
            f.ws, f.k, f.problem
          FROM (SELECT 1) one LEFT JOIN LATERAL (
            SELECT ws, k, problem FROM compared WHERE problem IS NOT NULL ORDER BY ws, seq NULLS LAST, o, k LIMIT 1
          ) f ON true
        $q$, c.table_name, c.workspace_sql, c.key_sql, c.join_sql)
        INTO checked, row_count, row_ws, row_k, row_problem
        USING only_workspace;

        table_name := c.table_name;
        rows_checked := checked;
        blocks := block_count;
        problems := row_count + link_count;
        -- A changed row is named before a broken link: it is what the link breakage points at.
        IF row_problem IS NOT NULL THEN
          workspace_id := row_ws; row_key := row_k; problem := row_problem;
        ELSE
          workspace_id := link_ws; row_key := link_key; problem := link_problem;
        END IF;
        RETURN NEXT;
      END LOOP;
    END $$;
  `)
  // Attach the chain to every evidence table there is (covering_removals once it exists), chain the rows already
  // in it in key order, and make sure none can be emptied with TRUNCATE.
  for (const [position, t] of TABLES.entries()) {
    const [found] = await qi.sequelize.query<{ pk: string[] | null, ws: boolean }>(`SELECT
        (SELECT array_agg(a.attname::text ORDER BY k.ord) FROM pg_index i CROSS JOIN LATERAL unnest(i.indkey) WITH ORDINALITY AS k(attnum, ord)
           JOIN pg_attribute a ON a.attrelid = i.indrelid AND a.attnum = k.attnum
         WHERE i.indrelid = to_regclass(:t) AND i.indisprimary) AS pk,
        EXISTS (SELECT 1 FROM pg_attribute WHERE attrelid = to_regclass(:t) AND attname = 'workspace_id' AND NOT attisdropped) AS ws
      WHERE to_regclass(:t) IS NOT NULL`, { type: QueryTypes.SELECT, replacements: { t: t.table } })
    if (!found) continue
    if (!found.pk?.length) throw new Error(`${t.table} has no primary key to name its rows by`)
    const key = found.pk.map(c => `r.${c}::text`).join(` || '/' || `)
    const order = found.pk.map(c => `r.${c}`).join(', ')
    const [workspace, join] = found.ws ? ['r.workspace_id', ''] : [t.workspace!, t.join!]
    await qi.sequelize.query(`
      INSERT INTO evidence_chain_tables (table_name, position, key_sql, order_sql, workspace_sql, join_sql)
        VALUES (${q(t.table)}, ${position + 1}, ${q(key)}, ${q(order)}, ${q(workspace)}, ${q(join)});
      CREATE TRIGGER ${t.table}_chain AFTER INSERT ON ${t.table} REFERENCING NEW TABLE AS new_rows
        FOR EACH STATEMENT EXECUTE FUNCTION tautline_chain_statement();
      SELECT tautline_chain_existing(${q(t.table)});
      DO $$ BEGIN
        IF NOT EXISTS (SELECT 1 FROM pg_trigger WHERE tgrelid = ${q(t.table)}::regclass AND tgname = ${q(`${t.table}_no_truncate`)}) THEN
          CREATE TRIGGER ${t.table}_no_truncate BEFORE TRUNCATE ON ${t.table} EXECUTE FUNCTION tautline_refuse_change();
        END IF;
      END $$;
    `)
  }
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const t of TABLES) await qi.sequelize.query(`DO $$ BEGIN IF to_regclass(${q(t.table)}) IS NOT NULL THEN DROP TRIGGER IF EXISTS ${t.table}_chain ON ${t.table}; END IF; END $$`)
  // The TRUNCATE refusals this migration added (0001 and 0005 made the others).
  await qi.sequelize.query(`DROP TRIGGER IF EXISTS activity_log_no_truncate ON activity_log; DROP TRIGGER IF EXISTS inspection_photos_no_truncate ON inspection_photos;`)
  await qi.sequelize.query(`
    DROP TABLE IF EXISTS evidence_chain_blocks, evidence_chain_heads, evidence_chain_tables CASCADE;
    DROP FUNCTION IF EXISTS tautline_evidence_verify(integer), tautline_chain_seal(), tautline_chain_block_guard(), tautline_chain_statement(),
      tautline_chain_rows_sql(text, text), tautline_chain_existing(text), tautline_block_hash(text, text, integer, bigint, text[], bytea[]), tautline_row_hash(text, text);
  `)
}
