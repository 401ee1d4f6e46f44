import { existsSync } from 'node:fs'
import { readFile } from 'node:fs/promises'
import { createRequire } from 'node:module'
import { join } from 'node:path'
import { inflateSync } from 'node:zlib'
import * as fontkitModule from '@pdf-lib/fontkit'
import type { PDFDocument, PDFFont } from 'pdf-lib'

// Public Sans for every PDF we draw (labels, reports), from @fontsource's WOFF files. Each file is read and
// unpacked once per process and kept.

type FontKit = typeof fontkitModule
export type KitFont = ReturnType<FontKit['create']>
// The package is UMD: under Node's ESM loader its API sits on `default`, under a bundler on the namespace.
export const fontkit: FontKit = (fontkitModule as FontKit & { default?: FontKit }).default ?? fontkitModule

const fontFiles = {
  regular: 'public-sans-latin-400-normal.woff',
  bold: 'public-sans-latin-700-normal.woff',
  // Letters outside Latin-1 (Ł, ő, ș…) live in a second subset, embedded only when a document needs them.
  regularExt: 'public-sans-latin-ext-400-normal.woff',
  boldExt: 'public-sans-latin-ext-700-normal.woff',
} as const
export type FontFile = keyof typeof fontFiles
export type Weight = 'regular' | 'bold'

/**
 * Where a font file sits. The built server (.output/server) carries only traced JavaScript, so look in the
 * project's node_modules from the working directory first (npm start and npm test run from the root).
 */
function fontPath(file: string): string {
  const fromCwd = join(process.cwd(), 'node_modules', '@fontsource', 'public-sans', 'files', file)
  if (existsSync(fromCwd)) return fromCwd
  return createRequire(import.meta.url).resolve(`@fontsource/public-sans/files/${file}`)
}

const fontBytesCache = new Map<FontFile, Promise<Uint8Array>>()
const kitCache = new Map<FontFile, KitFont>()

/**
 * Unpacks WOFF 1.0 into the plain TrueType it wraps. fontkit reads WOFF too, but inflates a whole table on every
 * glyph it reads; given the unpacked font once, embedding and subsetting in each PDF skip that work.
 */
export function woffToSfnt(woff: Uint8Array): Uint8Array {
  const src = new DataView(woff.buffer, woff.byteOffset, woff.byteLength)
  if (src.getUint32(0) !== 0x774f4646) return woff
  const numTables = src.getUint16(12)
  const tables = Array.from({ length: numTables }, (_, i) => {
    const at = 44 + i * 20
    const offset = src.getUint32(at + 4)
    const compLength = src.getUint32(at + 8)
    const origLength = src.getUint32(at + 12)
    const packed = woff.subarray(offset, offset + compLength)
    return { tag: src.getUint32(at), checksum: src.getUint32(at + 16), data: compLength < origLength ? new Uint8Array(inflateSync(packed)) : packed }
  })
  const headerLength = 12 + numTables * 16
  const size = tables.reduce((sum, t) => sum + ((t.data.byteLength + 3) & ~3), headerLength)
  const out = new Uint8Array(size)
  const dst = new DataView(out.buffer)
  const log2 = Math.floor(Math.log2(numTables))
  dst.setUint32(0, src.getUint32(4))
  dst.setUint16(4, numTables)
  dst.setUint16(6, 2 ** log2 * 16)
  dst.setUint16(8, log2)
  dst.setUint16(10, numTables * 16 - 2 ** log2 * 16)
  let offset = headerLength
  tables.forEach((t, i) => {
    dst.setUint32(12 + i * 16, t.tag)
    dst.setUint32(16 + i * 16, t.checksum)
    dst.setUint32(20 + i * 16, offset)
    dst.setUint32(24 + i * 16, t.data.byteLength)
    out.set(t.data, offset)
    offset += (t.data.byteLength + 3) & ~3
  })
  return out
}

export function fontBytes(which: FontFile): Promise<Uint8Array> {
  let bytes = fontBytesCache.get(which)
  if (!bytes) {
    bytes = readFile(fontPath(fontFiles[which])).then(b => woffToSfnt(new Uint8Array(b)))
    // A failed read is not cached, so a later request can try again.
    bytes.catch(() => fontBytesCache.delete(which))
    fontBytesCache.set(which, bytes)
  }
  return bytes
}

export async function kitFont(which: FontFile): Promise<KitFont> {
  let font = kitCache.get(which)
  if (!font) {
    font = fontkit.create(await fontBytes(which))
    kitCache.set(which, font)
  }
  return font
}

/** One weight of Public Sans: the Latin subset, and the Latin Extended one when a document needs it. */
export interface Face { main: PDFFont, ext: PDFFont | null }
/** The parsed Latin and Latin Extended fonts, to ask which one has a glyph. */
export interface Coverage { main: KitFont, ext: KitFont }
export interface Run { text: string, font: PDFFont }

export async function fontCoverage(): Promise<Coverage> {
  return { main: await kitFont('regular'), ext: await kitFont('regularExt') }
}

/** The parsed fonts behind each weight, to measure text from glyph advances without shaping it. */
export async function fontMetrics(): Promise<Record<Weight, Coverage>> {
  return {
    regular: { main: await kitFont('regular'), ext: await kitFont('regularExt') },
    bold: { main: await kitFont('bold'), ext: await kitFont('boldExt') },
  }
}

/** Reads every font file now, so a later drawing call does no file I/O of its own. */
export async function preloadFonts(): Promise<void> {
  await Promise.all((Object.keys(fontFiles) as FontFile[]).map(f => kitFont(f)))
}

/** Replaces characters neither subset can draw: first by their unaccented letter, else by '?'. */
export function drawable(text: string, coverage: Coverage): string {
  const flat = text.replace(/\s+/g, ' ').trim()
  // Printable ASCII, most of what a register holds, is all in the Latin subset.
  if (/^[\x20-\x7e]*$/.test(flat)) return flat
  const has = (cp: number) => coverage.main.hasGlyphForCodePoint(cp) || coverage.ext.hasGlyphForCodePoint(cp)
  let out = ''
  for (const ch of flat.normalize('NFC')) {
    if (has(ch.codePointAt(0)!)) {
      out += ch
      continue
    }
    const base = ch.normalize('NFKD').replace(/\p{M}/gu, '')
    out += base && [...base].every(b => has(b.codePointAt(0)!)) ? base : '?'
  }
  return out
}

export function needsExt(text: string, coverage: Coverage): boolean {
  for (const ch of text) if (!coverage.main.hasGlyphForCodePoint(ch.codePointAt(0)!)) return true
  return false
}

/** Splits text into runs of one font each: Latin Extended letters go to the second subset when it is embedded. */
export function textRuns(text: string, face: Face, coverage: Coverage): Run[] {
  if (!face.ext) return [{ text, font: face.main }]
  const out: Run[] = []
  for (const ch of text) {
    const font = face.ext && !coverage.main.hasGlyphForCodePoint(ch.codePointAt(0)!) ? face.ext : face.main
    const last = out[out.length - 1]
    if (last && last.font === font) last.text += ch
    else out.push({ text: ch, font })
  }
  return out
}

/** Embeds Public Sans regular and bold (subsetted) into a document, with Latin Extended only when asked. */
export async function embedPublicSans(doc: PDFDocument, withExt: boolean): Promise<Record<Weight, Face>> {
  doc.registerFontkit(fontkit)
  const embed = async (which: FontFile) => doc.embedFont(await fontBytes(which), { subset: true })
  return {
    regular: { main: await embed('regular'), ext: withExt ? await embed('regularExt') : null },
    bold: { main: await embed('bold'), ext: withExt ? await embed('boldExt') : null },
  }
}
