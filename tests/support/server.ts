import { spawn, spawnSync } from 'node:child_process'
import type { ChildProcess } from 'node:child_process'
import { existsSync, readdirSync } from 'node:fs'
import { createServer } from 'node:net'
import { dirname, join } from 'node:path'

/** A loopback port nothing listens on (taken from the system, then let go). */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const s = createServer()
    s.once('error', reject)
    s.listen(0, '127.0.0.1', () => {
      const { port } = s.address() as { port: number }
      s.close(() => resolve(port))
    })
  })
}

export interface RunningServer { base: string, process: ChildProcess, stop: () => Promise<void> }

/**
 * Another process of the same built server (`.output`, which `npm test` builds), with some variables changed:
 * for the fault tests, a server whose S3 or SMTP address points where nothing answers.
 */
export async function startServer(env: Record<string, string>, port?: number): Promise<RunningServer> {
  const p = port ?? await freePort()
  const child = spawn(process.execPath, [join(process.cwd(), '.output', 'server', 'index.mjs')], {
    cwd: process.cwd(), stdio: ['ignore', 'ignore', 'pipe'],
    // Its own address is its public one: state-changing requests from its pages carry that origin.
    env: { ...process.env, APP_URL: `http://127.0.0.1:${p}`, ...env, HOST: '127.0.0.1', NITRO_HOST: '127.0.0.1', PORT: String(p), NITRO_PORT: String(p), NODE_ENV: 'production' },
  })
  let stderr = ''
  child.stderr!.on('data', (d: Buffer) => { stderr = (stderr + d.toString()).slice(-4000) })
  const base = `http://127.0.0.1:${p}`
  const until = Date.now() + 30_000
  for (;;) {
    if (child.exitCode !== null) throw new Error(`the server on port ${p} exited: ${stderr}`)
    try {
      // Any answer will do: a server with a service down answers its health check with 503.
      await fetch(`${base}/api/health`)
      break
    }
    catch {
      if (Date.now() > until) throw new Error(`the server on port ${p} did not answer: ${stderr}`)
      await new Promise(r => setTimeout(r, 200))
    }
  }
  const stop = () => new Promise<void>((resolve) => {
    if (child.exitCode !== null) return resolve()
    child.once('exit', () => resolve())
    child.kill('SIGTERM')
  })
  return { base, process: child, stop }
}

/** The PostgreSQL cluster `npm test` runs in its data folder, when it runs one (not with DATABASE_URL set). */
export function embeddedPostgres(): { dataDir: string, pgCtl: (...args: string[]) => { status: number | null, output: string } } | null {
  const dataDir = process.env.TEST_DATA_DIR ? join(process.env.TEST_DATA_DIR, 'pg') : ''
  if (!dataDir || !existsSync(join(dataDir, 'PG_VERSION'))) return null
  const base = '/usr/lib/postgresql'
  const version = existsSync(base) ? readdirSync(base).filter(v => existsSync(join(base, v, 'bin', 'pg_ctl'))).sort((a, b) => Number(b) - Number(a))[0] : undefined
  const which = spawnSync('sh', ['-c', 'command -v pg_ctl'], { encoding: 'utf8' }).stdout.trim()
  const bin = version ? join(base, version, 'bin') : which ? dirname(which) : ''
  if (!bin) return null
  const isRoot = process.getuid?.() === 0
  const pgCtl = (...args: string[]) => {
    const cmd = join(bin, 'pg_ctl')
    const r = isRoot
      ? spawnSync('runuser', ['-u', 'postgres', '--', cmd, '-D', dataDir, ...args], { encoding: 'utf8' })
      : spawnSync(cmd, ['-D', dataDir, ...args], { encoding: 'utf8' })
    return { status: r.status, output: `${r.stdout}${r.stderr}` }
  }
  return { dataDir, pgCtl }
}
