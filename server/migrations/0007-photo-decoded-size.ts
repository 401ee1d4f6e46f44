import type { QueryInterface } from 'sequelize'

// A photo is kept only once it decoded, so every new row carries its pixel width and height. NOT VALID: rows
// written before decoding was required keep their NULLs (evidence is never changed), and are simply never counted
// as a decoded photo.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(`
    ALTER TABLE photos ADD CONSTRAINT photos_decoded_size
      CHECK (width_px IS NOT NULL AND height_px IS NOT NULL AND width_px > 0 AND height_px > 0) NOT VALID;
  `)
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query('ALTER TABLE photos DROP CONSTRAINT IF EXISTS photos_decoded_size')
}
