// Reads a captured .eml for the admin's mailbox: headers, the plain body, and the links in it.

export interface ReadMessage { headers: Array<[string, string]>, body: string, links: string[] }

/** Quoted-printable, as nodemailer writes plain text: soft line breaks and =XX bytes in UTF-8. */
function decodeQuotedPrintable(text: string): string {
  const joined = text.replace(/=\r?\n/g, '')
  const bytes: number[] = []
  for (let i = 0; i < joined.length; i++) {
    const hex = joined.slice(i + 1, i + 3)
    if (joined[i] === '=' && /^[0-9A-F]{2}$/i.test(hex)) {
      bytes.push(Number.parseInt(hex, 16))
      i += 2
    }
    else {
      bytes.push(...new TextEncoder().encode(joined[i]))
    }
  }
  return new TextDecoder().decode(new Uint8Array(bytes))
}

export function readMessage(raw: string): ReadMessage {
  const split = raw.search(/\r?\n\r?\n/)
  const head = split === -1 ? raw : raw.slice(0, split)
  let body = split === -1 ? '' : raw.slice(split).replace(/^\r?\n\r?\n/, '')
  const headers = head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/).map((line): [string, string] => {
    const at = line.indexOf(':')
    return at === -1 ? [line, ''] : [line.slice(0, at), line.slice(at + 1).trim()]
  })
  const encoding = headers.find(([k]) => k.toLowerCase() === 'content-transfer-encoding')?.[1].toLowerCase()
  if (encoding === 'quoted-printable') body = decodeQuotedPrintable(body)
  const links = [...new Set(body.match(/https?:\/\/[^\s<>"]+/g) ?? [])]
  return { headers, body, links }
}

/** A link to this app's own sign-in pages opens here as a path; anything else stays a plain URL. */
export function appPathOf(url: string): string | null {
  try {
    const u = new URL(url)
    return ['/welcome', '/reset-password', '/login'].includes(u.pathname) ? `${u.pathname}${u.search}` : null
  }
  catch {
    return null
  }
}
