import { ConnectionRefusedError, DatabaseError } from 'sequelize'
import { describe, expect, it } from 'vitest'
import { isDatabaseUnavailable } from '../../server/utils/errors'

// Which failures the server answers with 503 "database unreachable" rather than 500 (server/plugins/unavailable.ts).
describe('a database that cannot be reached', () => {
  process.env.DATABASE_URL = 'postgres://tautline@127.0.0.1:54339/tautline'
  const pgError = (message: string, code?: string) => Object.assign(new Error(message), code ? { code, severity: 'FATAL' } : {})

  it('is recognised when the connection is refused, cut, or the server is stopping or starting', () => {
    expect(isDatabaseUnavailable(new ConnectionRefusedError(Object.assign(new Error('connect ECONNREFUSED'), { code: 'ECONNREFUSED' })))).toBe(true)
    expect(isDatabaseUnavailable(new DatabaseError(pgError('terminating connection due to administrator command', '57P01') as never))).toBe(true)
    expect(isDatabaseUnavailable(new DatabaseError(pgError('the database system is starting up', '57P03') as never))).toBe(true)
    expect(isDatabaseUnavailable(new DatabaseError(pgError('Client has encountered a connection error and is not queryable') as never))).toBe(true)
    expect(isDatabaseUnavailable(new Error('Connection terminated unexpectedly'))).toBe(true)
    expect(isDatabaseUnavailable({ message: 'wrapped', cause: Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:54339'), { syscall: 'connect', port: 54339 }) })).toBe(true)
  })

  it('is not confused with a wrong query, or with photo storage or mail refusing a connection', () => {
    expect(isDatabaseUnavailable(new DatabaseError(pgError('relation "nope" does not exist', '42P01') as never))).toBe(false)
    expect(isDatabaseUnavailable(Object.assign(new Error('connect ECONNREFUSED 127.0.0.1:4579'), { code: 'ECONNREFUSED', syscall: 'connect', port: 4579 }))).toBe(false)
    expect(isDatabaseUnavailable({ message: 'wrapped', cause: Object.assign(new Error('read ECONNRESET'), { code: 'ECONNRESET' }) })).toBe(false)
    expect(isDatabaseUnavailable(new Error('Bad request'))).toBe(false)
    expect(isDatabaseUnavailable(undefined)).toBe(false)
  })
})
