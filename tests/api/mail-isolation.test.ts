import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import type pg from 'pg'
import { ApiClient, accounts, baseUrl, database, fixtureIds, signIn } from '../support/api'
import { linkIn, messagesTo, waitForMail } from '../support/mail'

// A hostile second workspace names the first workspace's manager as its own client's report contact, asks for
// a reset of that manager, tries to invite them, and e-mails a report to them. Each workspace's Mailbox must
// show only the mail it caused: no reset or invitation link, no report or PDF of the other.

let db: pg.Client
let ids: Awaited<ReturnType<typeof fixtureIds>>
let own: ApiClient
let other: ApiClient
let originalContact: string
const newcomer = `newcomer.${Date.now()}@demo.tautline.test`
const stranger = `stranger.${Date.now()}@other.tautline.test`
let resetToken: string
let inviteToken: string
let otherInviteToken: string

interface Item { id: number, kind: string, to: string[], subject: string, status: string, attachmentCount: number, createdAt: string }
const everything = async (client: ApiClient) => {
  const r = await client.get('/api/dev/mail?pageSize=100')
  expect(r.status, JSON.stringify(r.body)).toBe(200)
  return r.body.items as Item[]
}
const read = async (client: ApiClient, items: Item[]) => Promise.all(items.map(async i => (await client.get(`/api/dev/mail/${i.id}`)).body))

beforeAll(async () => {
  db = await database()
  ids = await fixtureIds(db)
  own = await signIn(accounts.admin)
  other = await signIn(accounts.otherAdmin)
  originalContact = (await db.query('SELECT report_email FROM clients WHERE id = $1', [ids.other.client])).rows[0].report_email

  // The other workspace may type any address as its client's report contact, the first workspace's manager included.
  expect((await other.patch(`/api/clients/${ids.other.client}`, { reportEmail: accounts.manager })).status).toBe(200)

  // Anyone may ask for a reset of that manager; the mail goes to the manager, for the manager's workspace.
  const before = messagesTo(accounts.manager).length
  expect((await new ApiClient().post('/api/auth/reset-request', { email: accounts.manager })).status).toBe(200)
  resetToken = linkIn(await waitForMail(accounts.manager, before), '/reset-password?token=').searchParams.get('token')!

  // The other workspace cannot invite an address that signs in elsewhere; each invites someone of its own.
  expect((await other.post('/api/users', { email: accounts.manager, name: 'Taken Over', role: 'installer' })).status).not.toBe(201)
  expect((await own.post('/api/users', { email: newcomer, name: 'New Comer', role: 'installer' })).status).toBe(201)
  inviteToken = linkIn(await waitForMail(newcomer), '/welcome?token=').searchParams.get('token')!
  expect((await other.post('/api/users', { email: stranger, name: 'Other Newcomer', role: 'installer' })).status).toBe(201)
  otherInviteToken = linkIn(await waitForMail(stranger), '/welcome?token=').searchParams.get('token')!

  // Each sends a site report: the other's goes to the first workspace's manager address.
  const managerMail = messagesTo(accounts.manager).length
  expect([201, 202]).toContain((await other.post(`/api/sites/${ids.other.site}/report/email`, {})).status)
  await waitForMail(accounts.manager, managerMail)
  expect([201, 202]).toContain((await own.post(`/api/sites/${ids.own.site}/report/email`, {})).status)
})

afterAll(async () => {
  await db?.query('UPDATE clients SET report_email = $1 WHERE id = $2', [originalContact, ids.other.client])
  await db?.end()
})

describe('the Mailbox shows only the mail a workspace caused', () => {
  it('the other workspace sees its own invitation and report, and none of the first workspace\'s mail, tokens or PDFs', async () => {
    const items = await everything(other)
    expect(items.some(i => i.kind === 'report' && i.subject.includes('Greyfield House'))).toBe(true)
    expect(items.some(i => i.kind === 'invite' && i.to.includes(stranger))).toBe(true)
    expect(items.filter(i => i.kind === 'reset')).toEqual([])
    expect(items.some(i => /Wattle Court/.test(i.subject))).toBe(false)
    const text = JSON.stringify(await read(other, items))
    expect(text).not.toContain(resetToken)
    expect(text).not.toContain(inviteToken)
    expect(text).not.toContain(newcomer)
    expect(text).not.toContain('Wattle Court')
  })

  it('the first workspace sees its reset, invitation and report, and none of the other\'s, though one went to its manager\'s address', async () => {
    const items = await everything(own)
    const reset = items.find(i => i.kind === 'reset' && i.to.includes(accounts.manager))
    expect(reset).toBeTruthy()
    expect(items.some(i => i.kind === 'invite' && i.to.includes(newcomer))).toBe(true)
    expect(items.some(i => i.kind === 'report' && i.subject.includes('Wattle Court'))).toBe(true)
    expect(items.some(i => i.subject.includes('Greyfield House'))).toBe(false)
    const text = JSON.stringify(await read(own, items))
    expect(text).not.toContain(otherInviteToken)
    expect(text).not.toContain(stranger)
    expect(text).not.toContain('Greyfield')
    // Read as a person reads it: the decoded text with its link, not the raw source.
    const message = (await own.get(`/api/dev/mail/${reset!.id}`)).body
    expect(message.subject).toBe('Reset your Tautline password')
    expect(message.text).toContain(`/reset-password?token=${resetToken}`)
    expect(message.text).not.toMatch(/Content-Transfer-Encoding|=\r?\n/)
  })

  it('answers 404 for the other workspace\'s message and attachment, both ways; the owner downloads its PDF', async () => {
    const mine = await everything(own)
    const theirs = await everything(other)
    const myReport = mine.find(i => i.kind === 'report' && i.subject.includes('Wattle Court'))!
    const theirReport = theirs.find(i => i.kind === 'report' && i.subject.includes('Greyfield House'))!
    expect(myReport.attachmentCount).toBe(1)
    const detail = (await own.get(`/api/dev/mail/${myReport.id}`)).body
    expect(detail.attachments[0]).toMatchObject({ fileName: expect.stringMatching(/\.pdf$/), sizeBytes: expect.any(Number) })
    const pdf = await fetch(`${baseUrl}${detail.attachments[0].url}`, { headers: { cookie: own.cookie! } })
    expect(pdf.status).toBe(200)
    expect(Buffer.from(await pdf.arrayBuffer()).subarray(0, 5).toString()).toBe('%PDF-')

    for (const i of mine) {
      expect((await other.get(`/api/dev/mail/${i.id}`)).status, `other reads message ${i.id}`).toBe(404)
      expect((await other.get(`/api/dev/mail/${i.id}/attachment?index=0`)).status).toBe(404)
    }
    for (const i of theirs) expect((await own.get(`/api/dev/mail/${i.id}`)).status, `own reads message ${i.id}`).toBe(404)
    expect((await own.get(`/api/dev/mail/${theirReport.id}/attachment?index=0`)).status).toBe(404)
  })

  it('no route reads the mail fake\'s folder: a stored message file is not found by name', async () => {
    const resetFile = messagesTo(accounts.manager).find(m => m.text.includes(resetToken))!.file
    for (const client of [own, other]) {
      const r = await client.get(`/api/dev/mail/${encodeURIComponent(resetFile)}`)
      expect(r.status).not.toBe(200)
      expect(JSON.stringify(r.body)).not.toContain(resetToken)
    }
  })

  it('other roles have no Mailbox', async () => {
    for (const who of [accounts.officer, accounts.manager]) {
      expect((await (await signIn(who)).get('/api/dev/mail')).status).toBe(403)
    }
  })
})
