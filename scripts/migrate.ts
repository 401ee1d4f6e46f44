// Applies pending migrations (never sync()). Used by `npm start`, `npm test` and by hand.
import { createSequelize, migrator } from '../server/db'

const sequelize = createSequelize(undefined, { poolMax: 2 })
const direction = process.argv[2] === 'down' ? 'down' : 'up'
try {
  const umzug = migrator(sequelize)
  const done = direction === 'up' ? await umzug.up() : await umzug.down()
  console.log(`[tautline] migrations ${direction}: ${done.length ? done.map(m => m.name).join(', ') : 'nothing to do'}`)
}
finally {
  await sequelize.close()
}
