import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { accounts, database, fixtureIds, signIn } from '../support/api'
import type { ApiClient } from '../support/api'
import { csvOf, importFile } from '../support/jobs'

// An import that names another client's site ref learns nothing about it: the answer reads exactly as for a
// ref that exists nowhere, and nothing is written into the other client's site. Only creating a site under
// that ref is refused (refs are unique in the workspace), with words that say neither whose it is nor what it holds.

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let manager: ApiClient, officer: ApiClient
const header = ['site_ref', 'site_name', 'address', 'jurisdiction', 'premises', 'unit_ref', 'unit_name', 'opening_ref', 'room', 'covering_ref', 'product_type', 'control']
const siteCells = { site_name: 'Copy Court', address: '9 Copy Lane, Kellerton NSW 2999', jurisdiction: 'AU', premises: 'rental_home' }
type RowError = { row: number, column: string, message: string }
const withRef = (errors: RowError[], from: string, to: string) => errors.map(e => ({ ...e, message: e.message.split(from).join(to) }))

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  manager = await signIn(accounts.manager)
  officer = await signIn(accounts.officer)
})
afterAll(async () => { await db.end() })

async function snapshot() {
  const r = await db.query(`SELECT s.name, s.address, s.updated_at, (SELECT count(*) FROM units u WHERE u.site_id = s.id)::int AS units,
    (SELECT count(*) FROM coverings c WHERE c.site_id = s.id)::int AS coverings, (SELECT count(*) FROM sites)::int AS sites FROM sites s WHERE s.id = $1`, [ids.clientTwo.site])
  return r.rows[0]
}

describe('another client\'s site ref in an import', () => {
  for (const [who, client, staff] of [['a manager', () => manager, false], ['staff', () => officer, true]] as const) {
    it(`answers ${who} as for a ref that does not exist, row by row`, async () => {
      const spr = await db.query('SELECT ref FROM sites WHERE id = $1', [ids.clientTwo.site]).then(r => r.rows[0].ref as string)
      const nowhere = 'NO-SUCH-SITE-9'
      const rows = (ref: string) => [
        { site_ref: ref, unit_ref: 'R1' },
        { site_ref: ref, unit_ref: 'R1', opening_ref: 'W1', room: 'Bedroom', covering_ref: `${ref}-77`, product_type: 'roller', control: 'chain_loop' },
        { site_ref: ref, site_name: 'Half Given', unit_ref: 'R2' },
      ]
      const options = staff ? { clientId: ids.own.client } : {}
      const before = await snapshot()
      const theirs = await importFile(client(), csvOf(header, rows(spr)), { ...options, mode: 'commit', skipInvalid: true })
      const none = await importFile(client(), csvOf(header, rows(nowhere)), { ...options, mode: 'commit', skipInvalid: true })
      expect(theirs.rowErrors.length).toBeGreaterThan(0)
      expect(withRef(theirs.rowErrors, spr, nowhere)).toEqual(none.rowErrors)
      expect(theirs.counts).toEqual(none.counts)
      expect(JSON.stringify(theirs)).not.toMatch(/another client|belongs/i)
      expect(await snapshot()).toEqual(before)
    })
  }

  it('refuses to create a site under that ref, without saying whose it is, and writes nothing', async () => {
    const r = await db.query('SELECT s.ref, s.name, s.address, c.name AS client FROM sites s JOIN clients c ON c.id = s.client_id WHERE s.id = $1', [ids.clientTwo.site])
    const { ref, name, address, client } = r.rows[0] as { ref: string, name: string, address: string, client: string }
    const before = await snapshot()
    const csv = csvOf(header, [{ site_ref: ref, ...siteCells, unit_ref: 'NEW1', opening_ref: 'W1', room: 'Hall', covering_ref: `${ref}-NEW`, product_type: 'roller', control: 'chain_loop' }])
    const dry = await importFile(manager, csv)
    expect(dry.rowErrors).toEqual([{ row: 2, column: 'site_ref', message: `${ref} cannot be used for a new site; choose another reference for it` }])
    const text = JSON.stringify(dry)
    for (const secret of [name, address, client, 'another client']) expect(text).not.toContain(secret)
    const committed = await importFile(manager, csv, { mode: 'commit', skipInvalid: true })
    expect(committed.counts.sites).toEqual({ created: 0, updated: 0, unchanged: 0 })
    expect(await snapshot()).toEqual(before)
    expect(Number((await db.query('SELECT count(*) AS n FROM sites WHERE ref = $1', [ref])).rows[0].n)).toBe(1)
  })
})
