import pg from 'pg'
import { Sequelize } from 'sequelize'
import { Umzug, SequelizeStorage } from 'umzug'
import { initModels } from '../models'
import * as foundation from '../migrations/0001-foundation'
import * as fitting from '../migrations/0002-fitting'
import * as audits from '../migrations/0003-audits'
import * as reportFiles from '../migrations/0004-report-files'
import * as jobsImportsRechecks from '../migrations/0005-jobs-imports-rechecks'
import * as mailAndSignIn from '../migrations/0006-mail-and-sign-in'
import * as photoDecodedSize from '../migrations/0007-photo-decoded-size'
import * as evidenceRules from '../migrations/0008-evidence-rules'
import * as evidenceChain from '../migrations/0009-evidence-chain'

// Plain module (no Nitro auto-imports) so scripts and the server share one way to connect.

// Bigint counts come back as numbers; ids and counts here stay far below 2^53.
pg.types.setTypeParser(20, (v: string) => Number.parseInt(v, 10))

export function databaseUrl(): string {
  const url = process.env.DATABASE_URL
  if (!url) throw new Error('DATABASE_URL is not set: run through `npm start` / `npm test`, or point it at PostgreSQL')
  return url
}

export function createSequelize(url = databaseUrl(), options: { poolMax?: number } = {}) {
  const sequelize = new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: false,
    pool: { max: options.poolMax ?? 10, min: 0, idle: 10_000, acquire: 10_000 },
    define: { underscored: true },
  })
  initModels(sequelize)
  return sequelize
}

// Migrations are listed here, in order, so that they travel inside the server bundle too.
const migrations = [
  { name: '0001-foundation', ...foundation },
  { name: '0002-fitting', ...fitting },
  { name: '0003-audits', ...audits },
  { name: '0004-report-files', ...reportFiles },
  { name: '0005-jobs-imports-rechecks', ...jobsImportsRechecks },
  { name: '0006-mail-and-sign-in', ...mailAndSignIn },
  { name: '0007-photo-decoded-size', ...photoDecodedSize },
  { name: '0008-evidence-rules', ...evidenceRules },
  { name: '0009-evidence-chain', ...evidenceChain },
]

export function migrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: migrations.map(m => ({ name: m.name, up: m.up, down: m.down })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
    logger: undefined,
  })
}
