import type { Sequelize } from 'sequelize'
import { createSequelize } from '../db'

let instance: Sequelize | undefined

/** The process-wide Sequelize instance, created on first use. */
export function useDb(): Sequelize {
  instance ??= createSequelize(undefined, { poolMax: Number(process.env.DB_POOL_MAX ?? 10) })
  return instance
}

export async function closeDb() {
  if (instance) await instance.close()
  instance = undefined
}
