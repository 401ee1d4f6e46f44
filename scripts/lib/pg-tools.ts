import { existsSync, readdirSync } from 'node:fs'
import { join } from 'node:path'

/** The newest PostgreSQL client tool from Debian's packages, else whatever is on PATH. */
export function pgTool(name: 'pg_dump' | 'pg_restore' | 'psql') {
  const base = '/usr/lib/postgresql'
  if (existsSync(base)) {
    const versions = readdirSync(base).filter(v => existsSync(join(base, v, 'bin', name))).sort((a, b) => Number(b) - Number(a))
    if (versions[0]) return join(base, versions[0], 'bin', name)
  }
  return name
}
