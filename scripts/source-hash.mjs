// The hash of every source file a build depends on. `scripts/run.mjs` stamps `.output` with it and rebuilds only when
// it changes; the load benchmark reads the same stamp, so either one's build serves both. Plain Node, no dependencies.
import { createHash } from 'node:crypto'
import { existsSync, readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'

const dirs = ['pages', 'components', 'layouts', 'middleware', 'stores', 'composables', 'server', 'shared', 'rules', 'assets', 'public', 'plugins', 'utils']
const files = ['app.vue', 'error.vue', 'nuxt.config.ts', 'tailwind.config.ts', 'package-lock.json', 'tsconfig.json']

/** @param {string} root the project folder @returns {string} */
export function sourceHash(root) {
  const h = createHash('sha256')
  /** @param {string} d */
  const walk = (d) => {
    if (!existsSync(d)) return
    for (const e of readdirSync(d, { withFileTypes: true }).sort((a, b) => a.name.localeCompare(b.name))) {
      const p = join(d, e.name)
      if (e.isDirectory()) walk(p)
      else { h.update(p); h.update(readFileSync(p)) }
    }
  }
  for (const d of dirs) walk(join(root, d))
  for (const f of files) if (existsSync(join(root, f))) { h.update(f); h.update(readFileSync(join(root, f))) }
  return h.digest('hex')
}
