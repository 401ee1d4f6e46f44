import { QueryTypes } from 'sequelize'
import { readdir, readFile, stat } from 'node:fs/promises'
import { join } from 'node:path'

// The local mail fake's folder of .eml files (MAIL_DIR); absent when a real SMTP relay is used.
export function mailDir(): string {
  const dir = process.env.MAIL_DIR
  if (!dir) throw createError({ statusCode: 404, message: 'No local mailbox: mail goes to a real SMTP relay here' })
  return dir
}

export function headerOf(raw: string, name: string) {
  const head = raw.split(/\r?\n\r?\n/, 1)[0] ?? ''
  const unfolded = head.replace(/\r?\n[ \t]+/g, ' ')
  const line = unfolded.split(/\r?\n/).find(l => l.toLowerCase().startsWith(`${name.toLowerCase()}:`))
  return line ? line.slice(name.length + 1).trim() : null
}

/** Addresses that belong to a workspace: its people and its clients' report contacts. */
export async function workspaceAddresses(workspaceId: number): Promise<Set<string>> {
  const rows = await useDb().query<{ email: string }>(
    `SELECT lower(email) AS email FROM users WHERE workspace_id = :ws UNION SELECT lower(report_email) FROM clients WHERE workspace_id = :ws`,
    { type: QueryTypes.SELECT, replacements: { ws: workspaceId } })
  return new Set(rows.map(r => r.email))
}

function addressedTo(raw: string, allowed: Set<string>) {
  const to = (headerOf(raw, 'To') ?? '').toLowerCase()
  return [...to.matchAll(/[^\s<>,"]+@[^\s<>,"]+/g)].some(m => allowed.has(m[0]))
}

/** The captured messages addressed to someone of this workspace, newest first; one workspace never sees another's. */
export async function listMailbox(workspaceId: number) {
  const dir = mailDir()
  const allowed = await workspaceAddresses(workspaceId)
  const names = (await readdir(dir)).filter(n => n.endsWith('.eml')).sort().reverse().slice(0, 500)
  const items = await Promise.all(names.map(async (name) => {
    const raw = await readFile(join(dir, name), 'utf8')
    if (!addressedTo(raw, allowed)) return null
    return { name, to: headerOf(raw, 'To'), subject: headerOf(raw, 'Subject'), date: headerOf(raw, 'Date'), sizeBytes: (await stat(join(dir, name))).size }
  }))
  return items.filter(i => i !== null)
}

export async function readMailboxMessage(workspaceId: number, name: string) {
  const raw = await readFile(join(mailDir(), name), 'utf8').catch(() => null)
  if (raw === null || !addressedTo(raw, await workspaceAddresses(workspaceId))) return null
  return { name, to: headerOf(raw, 'To'), subject: headerOf(raw, 'Subject'), date: headerOf(raw, 'Date'), raw }
}
