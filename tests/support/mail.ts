import { readdirSync, readFileSync } from 'node:fs'
import { join } from 'node:path'

// Reads what the SMTP fake stored: one .eml file per message in MAIL_DIR.
const dir = () => {
  const d = process.env.MAIL_DIR
  if (!d) throw new Error('MAIL_DIR is not set: run through npm test')
  return d
}

function decodeQuotedPrintable(s: string) {
  const bytes = s.replace(/=\r?\n/g, '').replace(/=([0-9A-F]{2})/g, (_, h: string) => String.fromCharCode(Number.parseInt(h, 16)))
  return Buffer.from(bytes, 'latin1').toString('utf8')
}

/** Headers with non-ASCII text arrive as RFC 2047 encoded words; turn them back into text. */
function decodeHeader(value: string) {
  return value.replace(/=\?utf-8\?([qb])\?([^?]*)\?=\s*/gi, (_, enc: string, text: string) => enc.toLowerCase() === 'b'
    ? Buffer.from(text, 'base64').toString('utf8')
    : Buffer.from(text.replace(/_/g, ' ').replace(/=([0-9A-F]{2})/gi, (_m: string, h: string) => String.fromCharCode(Number.parseInt(h, 16))), 'latin1').toString('utf8'))
}

export interface StoredMail { file: string, raw: string, to: string, subject: string, text: string }

export function messagesTo(address: string): StoredMail[] {
  return readdirSync(dir()).filter(f => f.endsWith('.eml')).sort().map((file) => {
    const raw = readFileSync(join(dir(), file), 'utf8')
    const head = raw.split(/\r?\n\r?\n/, 1)[0]!.replace(/\r?\n[ \t]+/g, ' ')
    const header = (n: string) => head.split(/\r?\n/).find(l => l.toLowerCase().startsWith(`${n}:`))?.slice(n.length + 1).trim() ?? ''
    return { file, raw, to: decodeHeader(header('to')), subject: decodeHeader(header('subject')), text: decodeQuotedPrintable(raw) }
  }).filter(m => m.to.toLowerCase().includes(address.toLowerCase()))
}

/** Waits for a message to arrive for the address and returns the newest one. */
export async function waitForMail(address: string, after = 0, ms = 10_000): Promise<StoredMail> {
  const until = Date.now() + ms
  while (Date.now() < until) {
    const found = messagesTo(address)
    if (found.length > after) return found[found.length - 1]!
    await new Promise(r => setTimeout(r, 100))
  }
  throw new Error(`no mail for ${address} within ${ms} ms`)
}

export function linkIn(mail: StoredMail, path: string) {
  const m = mail.text.match(new RegExp(`https?://[^\\s]+${path.replace(/[/?]/g, c => `\\${c}`)}[^\\s]*`))
  if (!m) throw new Error(`no ${path} link in the message`)
  return new URL(m[0])
}
