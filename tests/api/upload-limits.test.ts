import http from 'node:http'
import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { accounts, baseUrl, database, fixtureIds, signIn } from '../support/api'
import type { ApiClient } from '../support/api'
import { settled } from '../support/jobs'

// The documented limits (photos 15 MB, imports 32 MB, JSON bodies 1 MB) hold while the bytes arrive: past the limit
// the server answers 413 and stops reading, whether or not the request said how long it was.

const MB = 1024 * 1024
let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let officer: ApiClient
let installer: ApiClient

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  officer = await signIn(accounts.officer)
  installer = await signIn(accounts.installer)
})
afterAll(async () => { await db.end() })

const CSV_HEADER = 'site_ref,unit_ref,unit_name\n'
const boundary = '----tautline-limit-test'

function multipart(fields: Record<string, string>, fileName: string, fileType: string) {
  const head = Object.entries(fields).map(([k, v]) => `--${boundary}\r\nContent-Disposition: form-data; name="${k}"\r\n\r\n${v}\r\n`).join('')
    + `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="${fileName}"\r\nContent-Type: ${fileType}\r\n\r\n`
  return { head: Buffer.from(head), tail: Buffer.from(`\r\n--${boundary}--\r\n`), type: `multipart/form-data; boundary=${boundary}` }
}

interface Sent { status: number, body: any, written: number, total: number, writtenInAll: number }

/**
 * Sends `head`, then `fill` bytes of `filler`, then `tail`, as fast as the server takes them, with a Content-Length
 * or chunked, and says how much had been written when the answer came. Writing stops at the answer, or with
 * `keepSending` goes on for as long as the server takes bytes (`writtenInAll`: what it took before it closed).
 */
function send(path: string, cookie: string, type: string, parts: { head: Buffer, fill: number, filler: number, tail: Buffer }, chunked: boolean, keepSending = false): Promise<Sent> {
  const total = parts.head.byteLength + parts.fill + parts.tail.byteLength
  return new Promise((resolve, reject) => {
    let written = 0
    let answer: Omit<Sent, 'writtenInAll'> | undefined
    let sending = true
    const finish = () => { if (answer && !sending) resolve({ ...answer, writtenInAll: written }) }
    const headers: Record<string, string | number> = { 'content-type': type, cookie, 'accept': 'application/json' }
    if (!chunked) headers['content-length'] = total
    const req = http.request(`${baseUrl}${path}`, { method: 'POST', headers }, (res) => {
      const writtenAtAnswer = written
      if (!keepSending) sending = false
      const chunks: Buffer[] = []
      res.on('data', (c: Buffer) => chunks.push(c))
      res.on('end', () => {
        const text = Buffer.concat(chunks).toString('utf8')
        let body: unknown = text
        try { body = JSON.parse(text) }
        catch { /* not JSON */ }
        answer = { status: res.statusCode!, body, written: writtenAtAnswer, total }
        finish()
      })
    })
    req.setTimeout(60_000, () => req.destroy(new Error('no answer within 60 s')))
    req.on('error', (err) => {
      sending = false
      if (answer) finish()
      else reject(err)
    })
    req.on('close', () => { sending = false; finish() })
    const chunk = Buffer.alloc(256 * 1024, parts.filler)
    let filled = 0
    const write = (b: Buffer) => { written += b.byteLength; return req.write(b) }
    write(parts.head)
    const pump = () => {
      while (sending && filled < parts.fill) {
        const piece = chunk.subarray(0, Math.min(chunk.byteLength, parts.fill - filled))
        filled += piece.byteLength
        if (!write(piece)) { req.once('drain', pump); return }
      }
      if (sending) {
        write(parts.tail)
        req.end()
      }
    }
    pump()
  })
}

const objectCountOfImports = async () => Number((await db.query('SELECT count(*)::int AS n FROM imports')).rows[0].n)
const photoRows = async () => Number((await db.query('SELECT count(*)::int AS n FROM photos')).rows[0].n)

describe('imports', () => {
  it('takes a 20 MB file past the size guard (up to the documented 32 MB)', async () => {
    // One row, then 20 MB of blank lines, which the import skips: a file that is large but fine.
    const csv = Buffer.concat([Buffer.from(`${CSV_HEADER}WAT,LIMIT-20MB,Twenty megabytes\n`), Buffer.alloc(20 * MB, 0x0a)])
    const form = new FormData()
    form.append('mode', 'dry-run')
    form.append('clientId', String(ids.own.client))
    form.append('file', new Blob([csv], { type: 'text/csv' }), 'twenty.csv')
    const r = await officer.request('POST', '/api/imports', form)
    expect(r.status, JSON.stringify(r.body)).toBe(202)
    expect(r.body.sizeBytes).toBe(csv.byteLength)
    const done = await settled(officer, `/api/imports/${r.body.id}`)
    expect(done.status, done.error).toBe('succeeded')
  })

  it('refuses a 33 MB file that declares its length with 413 naming `file`, before it has been sent', async () => {
    const before = await objectCountOfImports()
    const form = multipart({ mode: 'dry-run', clientId: String(ids.own.client) }, 'big.csv', 'text/csv')
    const r = await send('/api/imports', officer.cookie!, form.type, { head: Buffer.concat([form.head, Buffer.from(CSV_HEADER)]), fill: 33 * MB, filler: 0x0a, tail: form.tail }, false)
    expect(r.status).toBe(413)
    expect(r.body.message).toMatch(/^file: .*32 MB/)
    expect(r.body.data.fields.file).toBeTruthy()
    // The answer came while most of the file was still unsent: the server did not read it.
    expect(r.written).toBeLessThan(r.total / 2)
    expect(await objectCountOfImports()).toBe(before)
  })

  it('refuses a chunked file with no length once 32 MB have arrived, and reads no further', async () => {
    const before = await objectCountOfImports()
    const form = multipart({ mode: 'dry-run', clientId: String(ids.own.client) }, 'endless.csv', 'text/csv')
    const r = await send('/api/imports', officer.cookie!, form.type, { head: Buffer.concat([form.head, Buffer.from(CSV_HEADER)]), fill: 100 * MB, filler: 0x0a, tail: form.tail }, true)
    expect(r.status).toBe(413)
    expect(r.body.message).toMatch(/^file: .*32 MB/)
    expect(r.body.data.fields.file).toBeTruthy()
    // 32 MB read, plus what the sockets' buffers hold; never the 100 MB sent at it.
    expect(r.written).toBeGreaterThan(32 * MB)
    expect(r.written).toBeLessThan(48 * MB)
    expect(await objectCountOfImports()).toBe(before)
  })

  it('does not read an upload it refuses for want of a session', async () => {
    const form = multipart({ mode: 'dry-run' }, 'anonymous.csv', 'text/csv')
    const r = await send('/api/imports', 'nuxt-session=none', form.type, { head: Buffer.concat([form.head, Buffer.from(CSV_HEADER)]), fill: 100 * MB, filler: 0x0a, tail: form.tail }, true, true)
    expect(r.status).toBe(401)
    // The client goes on sending after the answer; the server takes no more than its socket buffers hold.
    expect(r.writtenInAll).toBeLessThan(16 * MB)
  })
})

describe('photos and JSON bodies', () => {
  it('refuses a chunked photo once 15 MB have arrived, naming `file`, and keeps nothing', async () => {
    const rows = await photoRows()
    const form = multipart({ kind: 'whole' }, 'endless.jpg', 'image/jpeg')
    const r = await send(`/api/coverings/${ids.own.covering}/photos`, installer.cookie!, form.type, { head: Buffer.concat([form.head, Buffer.from([0xFF, 0xD8, 0xFF])]), fill: 60 * MB, filler: 0, tail: form.tail }, true)
    expect(r.status).toBe(413)
    expect(r.body.message).toMatch(/^file: .*15 MB/)
    expect(r.body.data.fields.file).toBeTruthy()
    expect(r.written).toBeLessThan(31 * MB)
    expect(await photoRows()).toBe(rows)
  })

  it('refuses a chunked JSON body once 1 MB has arrived, naming `body`, and reads no further', async () => {
    const r = await send(`/api/coverings/${ids.own.covering}/inspections`, installer.cookie!, 'application/json',
      { head: Buffer.from('{"kind":"fitting","note":"'), fill: 60 * MB, filler: 0x61, tail: Buffer.from('"}') }, true)
    expect(r.status).toBe(413)
    expect(r.body.message).toMatch(/^body: larger than 1 MB/)
    expect(r.body.data.fields.body).toBeTruthy()
    expect(r.written).toBeLessThan(17 * MB)
  })

  it('answers everyone as before once the refused bodies are gone', async () => {
    expect((await fetch(`${baseUrl}/api/health`)).status).toBe(200)
    expect((await installer.get('/api/sites?pageSize=5')).status).toBe(200)
  })
})
