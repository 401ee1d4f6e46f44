import { readdirSync } from 'node:fs'
import { join, relative } from 'node:path'

/** Every route file under server/api as `METHOD /api/path/:param`; a file without a method suffix is flagged. */
export function routeFiles(dir = join(process.cwd(), 'server/api')): Array<{ file: string, key: string }> {
  const out: Array<{ file: string, key: string }> = []
  const walk = (d: string) => {
    for (const e of readdirSync(d, { withFileTypes: true })) {
      const p = join(d, e.name)
      if (e.isDirectory()) { walk(p); continue }
      const rel = relative(dir, p).replace(/\\/g, '/')
      const m = rel.match(/^(.*)\.(get|post|patch|put|delete)\.ts$/)
      if (!m) { out.push({ file: rel, key: `NO-METHOD ${rel}` }); continue }
      const path = `/api/${m[1]!}`.replace(/\/index$/, '').replace(/\[(\w+)\]/g, ':$1')
      out.push({ file: rel, key: `${m[2]!.toUpperCase()} ${path}` })
    }
  }
  walk(dir)
  return out.sort((a, b) => a.key.localeCompare(b.key))
}
