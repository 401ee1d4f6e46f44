#!/usr/bin/env node
// The two commands. `npm start` and `npm test` both come here: install packages, start (or reuse)
// PostgreSQL and the S3 and mail fakes, migrate, seed, build, then serve or test.
// Plain Node with no dependencies, because the first thing it may do is install them.
import { spawn, spawnSync } from 'node:child_process'
import { createHash, randomBytes } from 'node:crypto'
import { existsSync, mkdirSync, readFileSync, writeFileSync, readdirSync, statSync, rmSync, openSync, chmodSync } from 'node:fs'
import { connect } from 'node:net'
import { tmpdir } from 'node:os'
import { dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { sourceHash } from './source-hash.mjs'

const root = resolve(dirname(fileURLToPath(import.meta.url)), '..')
const command = process.argv[2] ?? 'start'
const isRoot = typeof process.getuid === 'function' && process.getuid() === 0

const profiles = {
  dev: { appPort: 3000, pgPort: 54329, s3Port: 4569, smtpPort: 2525 },
  test: { appPort: 3100, pgPort: 54339, s3Port: 4579, smtpPort: 2535 },
}

function log(msg) { process.stdout.write(`[tautline] ${msg}\n`) }
function fail(msg) { process.stderr.write(`[tautline] ${msg}\n`); process.exit(1) }

function run(cmd, args, opts = {}) {
  const r = spawnSync(cmd, args, { stdio: 'inherit', cwd: root, ...opts })
  if (r.status !== 0) fail(`${cmd} ${args.join(' ')} failed (exit ${r.status ?? r.signal})`)
  return r
}
function quiet(cmd, args, opts = {}) {
  return spawnSync(cmd, args, { cwd: root, encoding: 'utf8', ...opts })
}
function has(cmd) { return quiet('sh', ['-c', `command -v ${cmd}`]).status === 0 }

function checkNode() {
  const [major, minor] = process.versions.node.split('.').map(Number)
  if (major < 20 || (major === 20 && minor < 19)) fail(`Node ${process.versions.node} is too old: Tautline needs Node 20.19 or later.`)
}

// Two runs must never install at once: npm ci empties node_modules first.
function ensurePackages() {
  const lockFile = join(root, 'package-lock.json')
  const stamp = join(root, 'node_modules', '.tautline-lock-hash')
  const want = createHash('sha256').update(readFileSync(lockFile)).digest('hex')
  if (existsSync(stamp) && readFileSync(stamp, 'utf8') === want) return
  const guard = join(root, '.install.lock')
  for (;;) {
    try { writeFileSync(guard, String(process.pid), { flag: 'wx' }); break }
    catch {
      if (!pidAlive(guard)) { rmSync(guard, { force: true }); continue }
      log('another run is installing packages; waiting')
      spawnSync('sleep', ['2'])
    }
  }
  try {
    if (existsSync(stamp) && readFileSync(stamp, 'utf8') === want) return
    log('installing packages (npm ci)')
    run('npm', ['ci', '--no-audit', '--no-fund'])
    writeFileSync(stamp, want)
  }
  finally {
    rmSync(guard, { force: true })
  }
}

function aptInstall(packages, why) {
  if (!isRoot) fail(`${why} is missing. Install it with: sudo apt-get install -y ${packages.join(' ')}`)
  log(`installing ${packages.join(', ')} from Debian (${why})`)
  run('apt-get', ['update', '-qq'])
  run('apt-get', ['install', '-y', '-qq', '--no-install-recommends', ...packages], { env: { ...process.env, DEBIAN_FRONTEND: 'noninteractive' } })
}

function pgBinDir() {
  const base = '/usr/lib/postgresql'
  if (existsSync(base)) {
    const versions = readdirSync(base).filter(v => existsSync(join(base, v, 'bin', 'initdb'))).sort((a, b) => Number(b) - Number(a))
    if (versions.length) return join(base, versions[0], 'bin')
  }
  if (has('initdb') && has('pg_ctl')) return dirname(quiet('sh', ['-c', 'command -v initdb']).stdout.trim())
  return null
}

// Run a PostgreSQL tool as the `postgres` user when we are root (initdb and postgres refuse root).
function asPostgres(bin, args, opts = {}) {
  return isRoot ? quiet('runuser', ['-u', 'postgres', '--', bin, ...args], opts) : quiet(bin, args, opts)
}

// The postgres user must be able to reach the data folder; a mktemp clone is 0700, so open the path for traversal.
function ensureTraversable(dir) {
  if (!isRoot) return
  let d = dir
  while (d !== '/') {
    if (quiet('runuser', ['-u', 'postgres', '--', 'test', '-x', d]).status !== 0) {
      const mode = statSync(d).mode & 0o777
      chmodSync(d, mode | 0o001)
      log(`allowed the postgres user to pass through ${d} (o+x)`)
    }
    d = dirname(d)
  }
}

function waitForPort(port, ms = 20_000) {
  const until = Date.now() + ms
  return new Promise((res, rej) => {
    const attempt = () => {
      const s = connect(port, '127.0.0.1')
      s.once('connect', () => { s.destroy(); res() })
      s.once('error', () => {
        s.destroy()
        if (Date.now() > until) rej(new Error(`nothing answers on 127.0.0.1:${port}`))
        else setTimeout(attempt, 150)
      })
    }
    attempt()
  })
}

async function ensurePostgres(dataDir, port) {
  let bin = pgBinDir()
  if (!bin) { aptInstall(['postgresql'], 'PostgreSQL'); bin = pgBinDir() }
  if (!bin) fail('PostgreSQL binaries not found after install')
  const pgDir = join(dataDir, 'pg')
  const logDir = join(dataDir, 'pglog')
  mkdirSync(pgDir, { recursive: true, mode: 0o700 })
  mkdirSync(logDir, { recursive: true })
  if (isRoot) {
    quiet('chown', ['-R', 'postgres:postgres', pgDir, logDir])
    ensureTraversable(pgDir)
  }
  if (!existsSync(join(pgDir, 'PG_VERSION'))) {
    log(`initialising PostgreSQL in ${pgDir}`)
    const r = asPostgres(join(bin, 'initdb'), ['-D', pgDir, '-U', 'tautline', '--auth=trust', '-E', 'UTF8', '--locale=C.UTF-8'])
    if (r.status !== 0) fail(`initdb failed:\n${r.stdout}\n${r.stderr}`)
    const extra = [
      '# Tautline: loopback only, a port of its own, no Unix socket',
      `listen_addresses = '127.0.0.1'`,
      `port = ${port}`,
      `unix_socket_directories = ''`,
      'max_connections = 200',
    ]
    const conf = join(pgDir, 'postgresql.conf')
    writeFileSync(conf, readFileSync(conf, 'utf8') + '\n' + extra.join('\n') + '\n')
  }
  const status = asPostgres(join(bin, 'pg_ctl'), ['-D', pgDir, 'status'])
  if (status.status !== 0) {
    log(`starting PostgreSQL on 127.0.0.1:${port}`)
    const r = asPostgres(join(bin, 'pg_ctl'), ['-D', pgDir, '-l', join(logDir, 'server.log'), '-w', '-t', '60', 'start'])
    if (r.status !== 0) fail(`PostgreSQL did not start:\n${r.stdout}\n${r.stderr}\nSee ${join(logDir, 'server.log')}`)
  }
  await waitForPort(port)
  const { default: pg } = await import('pg')
  const admin = new pg.Client({ connectionString: `postgres://tautline@127.0.0.1:${port}/postgres` })
  await admin.connect()
  const found = await admin.query(`SELECT 1 FROM pg_database WHERE datname = 'tautline'`)
  if (!found.rowCount) await admin.query('CREATE DATABASE tautline')
  await admin.end()
  return `postgres://tautline@127.0.0.1:${port}/tautline`
}

function pidAlive(pidFile) {
  if (!existsSync(pidFile)) return false
  const pid = Number(readFileSync(pidFile, 'utf8'))
  try { process.kill(pid, 0); return true }
  catch { return false }
}

async function ensureFake(name, script, args, port, dataDir) {
  const pidFile = join(dataDir, `${name}.pid`)
  if (pidAlive(pidFile)) {
    try { await waitForPort(port, 2000); return }
    catch { /* stale: start again */ }
  }
  log(`starting the ${name} fake on 127.0.0.1:${port}`)
  const out = openSync(join(dataDir, `${name}.log`), 'a')
  const child = spawn(process.execPath, [join(root, 'scripts', 'fakes', script), ...args], {
    cwd: root, detached: true, stdio: ['ignore', out, out],
  })
  writeFileSync(pidFile, String(child.pid))
  child.unref()
  await waitForPort(port)
}

function sessionSecret(dataDir) {
  if (process.env.NUXT_SESSION_PASSWORD) return process.env.NUXT_SESSION_PASSWORD
  const file = join(dataDir, 'session-secret')
  if (!existsSync(file)) writeFileSync(file, randomBytes(32).toString('hex'), { mode: 0o600 })
  return readFileSync(file, 'utf8').trim()
}

async function services(profileName) {
  const p = profiles[profileName]
  const dataDir = join(root, '.data', profileName)
  mkdirSync(dataDir, { recursive: true })
  const env = {
    NUXT_SESSION_PASSWORD: sessionSecret(dataDir),
    APP_URL: process.env.APP_URL ?? `http://127.0.0.1:${p.appPort}`,
    MAIL_FROM: process.env.MAIL_FROM ?? 'Tautline <no-reply@tautline.test>',
  }
  env.DATABASE_URL = process.env.DATABASE_URL ?? await ensurePostgres(dataDir, p.pgPort)
  if (process.env.S3_ENDPOINT) {
    if (!process.env.S3_BUCKET) fail('S3_ENDPOINT is set but S3_BUCKET is not')
  }
  else {
    const s3Dir = join(dataDir, 's3')
    mkdirSync(s3Dir, { recursive: true })
    await ensureFake('s3', 's3.mjs', ['--port', String(p.s3Port), '--dir', s3Dir, '--bucket', 'tautline-photos'], p.s3Port, dataDir)
    Object.assign(env, {
      S3_ENDPOINT: `http://127.0.0.1:${p.s3Port}`, S3_BUCKET: 'tautline-photos', S3_REGION: 'us-east-1',
      S3_ACCESS_KEY_ID: 'S3RVER', S3_SECRET_ACCESS_KEY: 'S3RVER', S3_FORCE_PATH_STYLE: '1',
    })
  }
  if (!process.env.SMTP_URL) {
    const mailDir = join(dataDir, 'mail')
    mkdirSync(mailDir, { recursive: true })
    await ensureFake('smtp', 'smtp.mjs', ['--port', String(p.smtpPort), '--dir', mailDir], p.smtpPort, dataDir)
    Object.assign(env, { SMTP_URL: `smtp://127.0.0.1:${p.smtpPort}`, MAIL_DIR: mailDir })
  }
  return { env: { ...process.env, ...env }, profile: p, dataDir }
}

function stopServices(profileName, { quietly = false } = {}) {
  const say = quietly ? () => {} : log
  const dataDir = join(root, '.data', profileName)
  for (const name of ['s3', 'smtp']) {
    const pidFile = join(dataDir, `${name}.pid`)
    if (pidAlive(pidFile)) {
      process.kill(Number(readFileSync(pidFile, 'utf8')), 'SIGTERM')
      say(`stopped the ${name} fake (${profileName})`)
    }
    rmSync(pidFile, { force: true })
  }
  const pgDir = join(dataDir, 'pg')
  const bin = pgBinDir()
  if (bin && existsSync(join(pgDir, 'postmaster.pid'))) {
    asPostgres(join(bin, 'pg_ctl'), ['-D', pgDir, '-m', 'fast', '-w', 'stop'])
    say(`stopped PostgreSQL (${profileName})`)
  }
}

// Rebuild only when a source file changed since the last build.
function build(env) {
  const stamp = join(root, '.output', '.tautline-source-hash')
  const want = sourceHash(root)
  if (existsSync(stamp) && readFileSync(stamp, 'utf8') === want && existsSync(join(root, '.output', 'server', 'index.mjs'))) {
    log('build is up to date')
    return
  }
  log('building the app (nuxt build)')
  run(join(root, 'node_modules', '.bin', 'nuxt'), ['build'], { env: { ...env, NODE_ENV: 'production' } })
  writeFileSync(stamp, want)
}

function tsx(script, args, env) {
  run(join(root, 'node_modules', '.bin', 'tsx'), [join(root, 'scripts', script), ...args], { env })
}

function serve(env, port) {
  return spawn(process.execPath, [join(root, '.output', 'server', 'index.mjs')], {
    cwd: root, stdio: 'inherit', env: { ...env, HOST: '127.0.0.1', NITRO_HOST: '127.0.0.1', PORT: String(port), NITRO_PORT: String(port), NODE_ENV: 'production' },
  })
}

async function waitForHealth(port, ms = 60_000) {
  const until = Date.now() + ms
  while (Date.now() < until) {
    try {
      const r = await fetch(`http://127.0.0.1:${port}/api/health`)
      if (r.ok) return
    }
    catch { /* not up yet */ }
    await new Promise(r => setTimeout(r, 250))
  }
  throw new Error(`the server did not become healthy on port ${port}`)
}

async function start() {
  checkNode()
  ensurePackages()
  const { env, profile } = await services('dev')
  tsx('migrate.ts', [], env)
  tsx('seed.ts', process.env.TAUTLINE_DEMO === '0' ? [] : ['--demo'], env)
  build(env)
  log(`serving on http://127.0.0.1:${profile.appPort} (Ctrl-C stops the server; \`npm run stop\` stops the services)`)
  const server = serve(env, profile.appPort)
  for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => server.kill('SIGTERM'))
  server.on('exit', code => process.exit(code ?? 0))
}

// One test run at a time on a machine, whichever checkout it is in: runs share the test ports.
async function takeTestLock() {
  const lock = join(tmpdir(), `tautline-test-${profiles.test.appPort}.lock`)
  let told = false
  for (;;) {
    try {
      writeFileSync(lock, String(process.pid), { flag: 'wx' })
      process.on('exit', () => rmSync(lock, { force: true }))
      return
    }
    catch {
      if (!pidAlive(lock)) { rmSync(lock, { force: true }); continue }
      if (!told) { log('another test run is in progress here; waiting for it to finish'); told = true }
      await new Promise(r => setTimeout(r, 2000))
    }
  }
}

async function test() {
  checkNode()
  await takeTestLock()
  ensurePackages()
  if (!existsSync('/usr/bin/chromium')) aptInstall(['chromium'], 'Chromium for the browser tests')
  if (!has('pdftotext') || !has('pdftoppm')) aptInstall(['poppler-utils'], 'pdftotext for the report tests')
  // A clean slate for every run: the test profile's data folder is rebuilt each time.
  if (!process.env.DATABASE_URL) {
    stopServices('test')
    rmSync(join(root, '.data', 'test'), { recursive: true, force: true })
  }
  const { env, profile, dataDir } = await services('test')
  const testEnv = { ...env, TAUTLINE_TEST: '1', APP_URL: `http://127.0.0.1:${profile.appPort}`, LOG_FILE: process.env.LOG_FILE ?? join(dataDir, 'server.log') }
  tsx('migrate.ts', [], testEnv)
  tsx('seed.ts', ['--demo', '--other-workspace'], testEnv)
  build(testEnv)
  const server = serve(testEnv, profile.appPort)
  let code = 1
  try {
    await waitForHealth(profile.appPort)
    const vitest = spawnSync(join(root, 'node_modules', '.bin', 'vitest'), ['run', ...process.argv.slice(3)], {
      cwd: root, stdio: 'inherit',
      env: { ...testEnv, TEST_BASE_URL: `http://127.0.0.1:${profile.appPort}`, TEST_DATA_DIR: dataDir },
    })
    code = vitest.status ?? 1
  }
  finally {
    server.kill('SIGTERM')
    // Quietly, so vitest's summary stays the last thing printed.
    if (!process.env.DATABASE_URL && !process.env.TAUTLINE_KEEP_SERVICES) stopServices('test', { quietly: true })
  }
  process.exit(code)
}

async function main() {
  if (command === 'start') return start()
  if (command === 'test') return test()
  if (command === 'stop') {
    stopServices('dev')
    stopServices('test')
    return
  }
  if (command === 'backup' || command === 'restore') {
    ensurePackages()
    const { env } = await services(process.env.TAUTLINE_PROFILE ?? 'dev')
    tsx(`${command}.ts`, process.argv.slice(3), env)
    return
  }
  if (command === 'verify') {
    // Only PostgreSQL is needed; the script's own exit code (1 = a chain is broken) is passed on.
    ensurePackages()
    const profile = profiles[process.env.TAUTLINE_PROFILE ?? 'dev']
    if (!profile) fail(`unknown TAUTLINE_PROFILE ${process.env.TAUTLINE_PROFILE}: use dev or test`)
    const url = process.env.DATABASE_URL ?? await ensurePostgres(join(root, '.data', process.env.TAUTLINE_PROFILE ?? 'dev'), profile.pgPort)
    const r = spawnSync(join(root, 'node_modules', '.bin', 'tsx'), [join(root, 'scripts', 'verify.ts'), ...process.argv.slice(3)],
      { stdio: 'inherit', cwd: root, env: { ...process.env, DATABASE_URL: url } })
    process.exit(r.status ?? 1)
  }
  if (command === 'services') {
    ensurePackages()
    const { env } = await services(process.argv[3] ?? 'dev')
    for (const k of ['DATABASE_URL', 'S3_ENDPOINT', 'S3_BUCKET', 'SMTP_URL', 'MAIL_DIR']) if (env[k]) process.stdout.write(`${k}=${env[k]}\n`)
    return
  }
  fail(`unknown command ${command}: use start, test, stop, services, backup, restore or verify`)
}

main().catch(err => fail(err?.stack ?? String(err)))
