import { PDFDocument, PrintScaling, rgb } from 'pdf-lib'
import type { Color, PDFPage } from 'pdf-lib'
import { create as createQr } from 'qrcode'
import { QueryTypes } from 'sequelize'
import type { Sequelize } from 'sequelize'
import { z } from 'zod'
import { drawable, embedPublicSans, fontCoverage, needsExt, textRuns } from './pdf-fonts'
import type { Coverage, Face, Run, Weight } from './pdf-fonts'

// Installer labels: one sticker per fitted covering, naming the business that fitted it, with a QR code
// back to the covering's record and a child-safety caution. Plain module so scripts can print labels too.

export const PRODUCT_NAME = 'Tautline'

/** The caution on every label. It warns and instructs; it never claims the fitting is certified. */
export const LABEL_CAUTION = 'Cords and chains can strangle young children. Keep them out of reach, move cots and furniture away from them, and leave this label in place.'

export const sheetNames = ['a4-14', 'letter-10'] as const
export type SheetName = typeof sheetNames[number]

export interface LabelData {
  coveringId: number
  coveringRef: string
  siteName: string
  unitRef: string
  room: string
  fittedOn: string | null
  business: { name: string, phone: string | null, email: string | null, licenceNumber: string | null }
  url: string
}

const ptPerMm = 72 / 25.4
const ptPerIn = 72

interface SheetSpec {
  pageWidthPt: number
  pageHeightPt: number
  columns: number
  rows: number
  labelWidthPt: number
  labelHeightPt: number
  topMarginPt: number
  sideMarginPt: number
  columnGapPt: number
}

// The two common die-cut sticker sheets; the margins and gaps add up exactly to the page size.
export const labelSheets: Record<SheetName, SheetSpec> = {
  'a4-14': {
    pageWidthPt: 210 * ptPerMm, pageHeightPt: 297 * ptPerMm, columns: 2, rows: 7,
    labelWidthPt: 99.1 * ptPerMm, labelHeightPt: 38.1 * ptPerMm,
    topMarginPt: 15.15 * ptPerMm, sideMarginPt: 4.65 * ptPerMm, columnGapPt: 2.5 * ptPerMm,
  },
  'letter-10': {
    pageWidthPt: 8.5 * ptPerIn, pageHeightPt: 11 * ptPerIn, columns: 2, rows: 5,
    labelWidthPt: 4 * ptPerIn, labelHeightPt: 2 * ptPerIn,
    topMarginPt: 0.5 * ptPerIn, sideMarginPt: 0.15625 * ptPerIn, columnGapPt: 0.1875 * ptPerIn,
  },
}

export function slotsPerSheet(sheet: SheetName): number {
  return labelSheets[sheet].columns * labelSheets[sheet].rows
}

/** The slot's label rectangle in PDF points, origin bottom-left of the page; slots count 1-based, row by row. */
export function slotRect(sheet: SheetName, slot: number) {
  const s = labelSheets[sheet]
  const index = slot - 1
  const column = index % s.columns
  const row = Math.floor(index / s.columns)
  const xPt = s.sideMarginPt + column * (s.labelWidthPt + s.columnGapPt)
  const topPt = s.topMarginPt + row * s.labelHeightPt
  return { xPt, yPt: s.pageHeightPt - topPt - s.labelHeightPt, widthPt: s.labelWidthPt, heightPt: s.labelHeightPt }
}

/** US and Canadian sites usually buy Letter sheets; everywhere else A4. */
export function defaultSheetFor(jurisdiction: string): SheetName {
  return jurisdiction === 'US' || jurisdiction === 'CA' ? 'letter-10' : 'a4-14'
}

/** Query of both label routes: the sheet, and the first free slot on a part-used sheet. */
export const labelQuerySchema = z.object({
  sheet: z.enum(sheetNames, { error: `sheet must be one of ${sheetNames.join(', ')}` }).optional(),
  position: z.coerce.number({ error: 'position must be a number' }).int('position must be a whole number')
    .min(1, 'position starts at 1').max(Math.max(...sheetNames.map(slotsPerSheet)), 'position is beyond the last slot of any sheet').default(1),
})

/** A position past the sheet's last slot, named like a validation error (null when it fits). */
export function positionProblem(sheet: SheetName, position: number): string | null {
  const slots = slotsPerSheet(sheet)
  return position > slots ? `position must be at most ${slots} on a ${sheet} sheet` : null
}

export function labelPdfHeaders(ref: string): Record<string, string> {
  // Refs may hold spaces, slashes and #; a header filename keeps only safe characters.
  const safeRef = ref.replace(/[^\w.-]+/g, '-').replace(/^-+|-+$/g, '') || 'covering'
  return { 'Content-Type': 'application/pdf', 'Content-Disposition': `inline; filename="tautline-labels-${safeRef}.pdf"` }
}

// ---------------------------------------------------------------------------------------------
// Text on a label: Public Sans (loaded by pdf-fonts.ts), with the Latin Extended subset where a name needs it.

interface Word { text: string, weight: Weight }

class Typesetter {
  constructor(private readonly faces: { regular: Face, bold: Face }, private readonly coverage: Coverage) {}

  runs(text: string, weight: Weight): Run[] {
    return textRuns(text, this.faces[weight], this.coverage)
  }

  widthPt(text: string, weight: Weight, sizePt: number): number {
    return this.runs(text, weight).reduce((sum, r) => sum + r.font.widthOfTextAtSize(r.text, sizePt), 0)
  }

  draw(page: PDFPage, text: string, at: { xPt: number, yPt: number, sizePt: number, weight: Weight, color: Color }) {
    let x = at.xPt
    for (const run of this.runs(text, at.weight)) {
      page.drawText(run.text, { x, y: at.yPt, size: at.sizePt, font: run.font, color: at.color })
      x += run.font.widthOfTextAtSize(run.text, at.sizePt)
    }
  }

  /** Cuts text to the width with a trailing ellipsis (whole text when it fits). */
  truncate(text: string, weight: Weight, sizePt: number, maxWidthPt: number): string {
    if (this.widthPt(text, weight, sizePt) <= maxWidthPt) return text
    const chars = [...text]
    let lo = 0
    let hi = chars.length
    while (lo < hi) {
      const mid = Math.ceil((lo + hi) / 2)
      if (this.widthPt(`${chars.slice(0, mid).join('').trimEnd()}…`, weight, sizePt) <= maxWidthPt) lo = mid
      else hi = mid - 1
    }
    return lo === 0 ? '…' : `${chars.slice(0, lo).join('').trimEnd()}…`
  }

  /** One line: shrinks from the preferred size down to the smallest, then truncates at the smallest. */
  fit(text: string, weight: Weight, maxSizePt: number, minSizePt: number, maxWidthPt: number) {
    const widthAtMax = this.widthPt(text, weight, maxSizePt)
    if (widthAtMax <= maxWidthPt) return { text, sizePt: maxSizePt }
    const sizePt = Math.floor((maxSizePt * maxWidthPt / widthAtMax) * 4) / 4
    if (sizePt >= minSizePt) return { text, sizePt }
    return { text: this.truncate(text, weight, minSizePt, maxWidthPt), sizePt: minSizePt }
  }

  /**
   * Word-wraps mixed-weight text into at most maxLines, shrinking as needed; if it still does not fit at the
   * smallest size, the last line ends in an ellipsis. Never wider than maxWidthPt.
   */
  wrap(parts: Array<{ text: string, weight: Weight }>, maxSizePt: number, minSizePt: number, maxWidthPt: number, maxLines: number) {
    const words = parts.flatMap(p => p.text.split(' ').filter(Boolean).map(text => ({ text, weight: p.weight })))
    const lineWidth = (line: Word[], sizePt: number) =>
      line.reduce((sum, w, i) => sum + this.widthPt(w.text, w.weight, sizePt) + (i ? this.widthPt(' ', 'regular', sizePt) : 0), 0)
    const lay = (sizePt: number) => {
      const lines: Word[][] = []
      for (const word of words) {
        const last = lines[lines.length - 1]
        if (last && lineWidth([...last, word], sizePt) <= maxWidthPt) last.push(word)
        else lines.push([word])
      }
      return lines
    }
    for (let sizePt = maxSizePt; sizePt > minSizePt; sizePt -= 0.25) {
      const lines = lay(sizePt)
      if (lines.length <= maxLines && lines.every(l => lineWidth(l, sizePt) <= maxWidthPt)) return { lines, sizePt }
    }
    const lines = lay(minSizePt)
    const squeeze = (line: Word[]): Word[] => lineWidth(line, minSizePt) <= maxWidthPt
      ? line
      : [{ text: this.truncate(line.map(w => w.text).join(' '), 'regular', minSizePt, maxWidthPt), weight: 'regular' }]
    const kept = lines.slice(0, maxLines)
    if (lines.length > maxLines) kept[maxLines - 1] = [{ text: lines.slice(maxLines - 1).flat().map(w => w.text).join(' '), weight: 'regular' }]
    return { lines: kept.map(squeeze), sizePt: minSizePt }
  }

  /** Draws one wrapped line, word by word in each word's weight. */
  drawWords(page: PDFPage, line: Word[], at: { xPt: number, yPt: number, sizePt: number, color: Color }) {
    let x = at.xPt
    line.forEach((word, i) => {
      if (i) x += this.widthPt(' ', 'regular', at.sizePt)
      this.draw(page, word.text, { ...at, xPt: x, weight: word.weight })
      x += this.widthPt(word.text, word.weight, at.sizePt)
    })
  }

  /** Site, unit and room on one line; a long site name gives way first, since unit and room find the window. */
  place(site: string, unit: string, room: string, maxSizePt: number, minSizePt: number, maxWidthPt: number) {
    const sep = '  ·  '
    const whole = this.fit([site, unit, room].filter(Boolean).join(sep), 'regular', maxSizePt, minSizePt, maxWidthPt)
    const tail = [unit, room].filter(Boolean).join(sep)
    if (!whole.text.endsWith('…') || !tail || !site) return whole
    // The site keeps at least a quarter of the line; unit and room take the rest, cut only if they must be.
    const tailWidthPt = this.widthPt(`${sep}${tail}`, 'regular', minSizePt)
    const siteWidthPt = Math.max(maxWidthPt * 0.25, maxWidthPt - tailWidthPt)
    const siteText = this.truncate(site, 'regular', minSizePt, siteWidthPt)
    const tailText = this.truncate(`${sep}${tail}`, 'regular', minSizePt, maxWidthPt - this.widthPt(siteText, 'regular', minSizePt))
    return { text: `${siteText}${tailText}`, sizePt: minSizePt }
  }
}

// ---------------------------------------------------------------------------------------------
// Drawing one label.

/** Type sizes and spacing per sheet: the Letter label is taller, so it gets a larger QR and type. */
interface LabelStyle {
  padPt: number
  qrPt: number
  gutterPt: number
  nameSizePt: number
  minNameSizePt: number
  detailSizePt: number
  fieldLabelSizePt: number
  fieldValueSizePt: number
  placeSizePt: number
  cautionSizePt: number
  minTextSizePt: number
  captionSizePt: number
}
const labelStyles: Record<SheetName, LabelStyle> = {
  'a4-14': {
    padPt: 8.5, qrPt: 84, gutterPt: 9, nameSizePt: 10.5, minNameSizePt: 7, detailSizePt: 6.5, fieldLabelSizePt: 5.5,
    fieldValueSizePt: 9, placeSizePt: 7, cautionSizePt: 5.6, minTextSizePt: 5, captionSizePt: 5,
  },
  'letter-10': {
    padPt: 10, qrPt: 96, gutterPt: 10, nameSizePt: 12, minNameSizePt: 7.5, detailSizePt: 8, fieldLabelSizePt: 6.2,
    fieldValueSizePt: 11, placeSizePt: 8.5, cautionSizePt: 6.8, minTextSizePt: 5, captionSizePt: 5.8,
  },
}

const brand = rgb(0x1d / 255, 0x3b / 255, 0x36 / 255)
const ink = rgb(0.1, 0.1, 0.1)
const muted = rgb(0.36, 0.38, 0.38)
const hairline = rgb(0.72, 0.76, 0.75)
const black = rgb(0, 0, 0)

/** The QR modules as one filled path of row runs: one fill, so no hairline seams between modules. */
function drawQr(page: PDFPage, url: string, box: { xPt: number, yTopPt: number, sizePt: number }) {
  const qr = createQr(url, { errorCorrectionLevel: 'M' })
  const modules = qr.modules.size
  // Two modules of quiet zone inside the box; the label's own margin and gutter add the rest.
  const quietModules = 2
  const modulePt = box.sizePt / (modules + 2 * quietModules)
  let path = ''
  for (let row = 0; row < modules; row++) {
    let col = 0
    while (col < modules) {
      const start = col
      while (col < modules && qr.modules.get(row, col)) col++
      if (col > start) path += `M${start} ${row}H${col}V${row + 1}H${start}Z`
      else col++
    }
  }
  // drawSvgPath measures y downwards from (x, y), as QR rows run.
  page.drawSvgPath(path, {
    x: box.xPt + quietModules * modulePt, y: box.yTopPt - quietModules * modulePt, scale: modulePt, color: black, borderWidth: 0,
  })
}

/** A small warning triangle with an exclamation mark, drawn as vectors beside the caution. */
function drawWarningMark(page: PDFPage, xPt: number, yTopPt: number, sizePt: number) {
  const h = sizePt * 0.9
  page.drawSvgPath(`M${sizePt / 2} 0L${sizePt} ${h}L0 ${h}Z`, { x: xPt, y: yTopPt, color: brand, borderWidth: 0 })
  const barW = sizePt * 0.11
  page.drawRectangle({ x: xPt + sizePt / 2 - barW / 2, y: yTopPt - h * 0.68, width: barW, height: h * 0.36, color: rgb(1, 1, 1) })
  page.drawRectangle({ x: xPt + sizePt / 2 - barW / 2, y: yTopPt - h * 0.88, width: barW, height: barW, color: rgb(1, 1, 1) })
}

function drawLabel(page: PDFPage, t: Typesetter, label: LabelData, sheet: SheetName, slot: number) {
  const st = labelStyles[sheet]
  const r = slotRect(sheet, slot)
  const left = r.xPt + st.padPt
  const top = r.yPt + r.heightPt - st.padPt
  const bottom = r.yPt + st.padPt
  const innerHeightPt = r.heightPt - 2 * st.padPt

  // Right column: the QR with its caption just below, the pair centred in the label's height.
  const captionGapPt = st.captionSizePt + 1.5
  const qrSizePt = Math.min(st.qrPt, innerHeightPt - captionGapPt)
  const qrLeft = r.xPt + r.widthPt - st.padPt - qrSizePt
  const qrTop = top - (innerHeightPt - qrSizePt - captionGapPt) / 2
  drawQr(page, label.url, { xPt: qrLeft, yTopPt: qrTop, sizePt: qrSizePt })
  const caption = t.fit('Scan for the fitting record', 'regular', st.captionSizePt, st.minTextSizePt, qrSizePt)
  t.draw(page, caption.text, {
    xPt: qrLeft + (qrSizePt - t.widthPt(caption.text, 'regular', caption.sizePt)) / 2, yPt: qrTop - qrSizePt - caption.sizePt * 0.9,
    sizePt: caption.sizePt, weight: 'regular', color: muted,
  })

  // Left column: who fitted it (top), what and where (middle), the caution (bottom).
  const textWidthPt = qrLeft - st.gutterPt - left
  const b = label.business

  const name = t.fit(b.name, 'bold', st.nameSizePt, st.minNameSizePt, textWidthPt)
  const contactLine = [b.phone, b.licenceNumber ? `Licence ${b.licenceNumber}` : null].filter(Boolean).join('  ·  ')
  const contact = contactLine ? t.fit(contactLine, 'regular', st.detailSizePt, st.minTextSizePt, textWidthPt) : null
  const email = b.email ? t.fit(b.email, 'regular', st.detailSizePt, st.minTextSizePt, textWidthPt) : null

  const warnPt = st.cautionSizePt * 1.7
  const cautionIndentPt = warnPt + 3
  // The danger in bold, what to do in regular weight.
  const leadEnd = LABEL_CAUTION.indexOf('. ') + 1
  const caution = t.wrap([{ text: LABEL_CAUTION.slice(0, leadEnd), weight: 'bold' }, { text: LABEL_CAUTION.slice(leadEnd), weight: 'regular' }],
    st.cautionSizePt, st.minTextSizePt, textWidthPt - cautionIndentPt, 3)
  const cautionLinePt = caution.sizePt * 1.22
  const cautionHeightPt = caution.lines.length * cautionLinePt

  const fieldsHeightPt = st.fieldLabelSizePt * 1.3 + st.fieldValueSizePt * 1.1
  const placeLinePt = st.placeSizePt * 1.3
  const topHeightPt = name.sizePt * 1.05 + (contact ? st.detailSizePt * 1.3 : 0) + (email ? st.detailSizePt * 1.3 : 0)
  const middleHeightPt = 1 + fieldsHeightPt + placeLinePt
  // Whatever height is left is shared between the two gaps, so the blocks sit evenly on any sheet.
  const gapPt = Math.max(2, (innerHeightPt - topHeightPt - middleHeightPt - cautionHeightPt) / 2)

  let y = top - name.sizePt * 0.8
  t.draw(page, name.text, { xPt: left, yPt: y, sizePt: name.sizePt, weight: 'bold', color: brand })
  y -= name.sizePt * 0.25
  for (const line of [contact, email]) {
    if (!line) continue
    y -= st.detailSizePt * 1.3
    t.draw(page, line.text, { xPt: left, yPt: y, sizePt: line.sizePt, weight: 'regular', color: ink })
  }

  y -= gapPt * 0.8
  page.drawLine({ start: { x: left, y }, end: { x: left + textWidthPt, y }, thickness: 0.5, color: hairline })

  // Two small fields side by side: the fitting date and the covering's reference.
  const dateColumnPt = Math.min(textWidthPt * 0.45, t.widthPt('0000-00-00', 'bold', st.fieldValueSizePt) + 12)
  y -= st.fieldLabelSizePt * 1.3 + 1
  t.draw(page, 'Fitted', { xPt: left, yPt: y, sizePt: st.fieldLabelSizePt, weight: 'regular', color: muted })
  t.draw(page, 'Covering', { xPt: left + dateColumnPt, yPt: y, sizePt: st.fieldLabelSizePt, weight: 'regular', color: muted })
  y -= st.fieldValueSizePt * 1.1
  if (label.fittedOn) {
    t.draw(page, label.fittedOn, { xPt: left, yPt: y, sizePt: st.fieldValueSizePt, weight: 'bold', color: ink })
  }
  else {
    // No date on record: a line the fitter can write the date on.
    page.drawLine({ start: { x: left, y: y - 1 }, end: { x: left + dateColumnPt - 8, y: y - 1 }, thickness: 0.5, color: muted })
  }
  const ref = t.fit(label.coveringRef, 'bold', st.fieldValueSizePt, st.minTextSizePt, textWidthPt - dateColumnPt)
  t.draw(page, ref.text, { xPt: left + dateColumnPt, yPt: y, sizePt: ref.sizePt, weight: 'bold', color: ink })

  const place = t.place(label.siteName, label.unitRef, label.room, st.placeSizePt, st.minTextSizePt, textWidthPt)
  y -= placeLinePt
  t.draw(page, place.text, { xPt: left, yPt: y, sizePt: place.sizePt, weight: 'regular', color: ink })

  // The caution sits on the bottom edge of the text column, with its mark level with the first line.
  let cy = bottom + cautionHeightPt - cautionLinePt + (cautionLinePt - caution.sizePt) + 0.5
  drawWarningMark(page, left, cy + caution.sizePt * 0.85, warnPt)
  for (const line of caution.lines) {
    t.drawWords(page, line, { xPt: left + cautionIndentPt, yPt: cy, sizePt: caution.sizePt, color: ink })
    cy -= cautionLinePt
  }
}

/**
 * Renders installer labels onto sticker sheets, in order, starting at `startPosition` (1-based) on the first
 * sheet so a part-used sheet can go through the printer again. Further labels flow onto further pages.
 */
export async function renderLabelsPdf(labels: LabelData[], options: { sheet: SheetName, startPosition?: number, title?: string }): Promise<Uint8Array> {
  const spec = labelSheets[options.sheet]
  const slots = slotsPerSheet(options.sheet)
  const startPosition = options.startPosition ?? 1
  if (!Number.isInteger(startPosition) || startPosition < 1 || startPosition > slots) {
    throw new RangeError(`startPosition must be a whole number from 1 to ${slots} on a ${options.sheet} sheet`)
  }
  if (labels.length === 0) throw new RangeError('no labels to render')

  const coverage = await fontCoverage()
  const cleaned = labels.map(l => ({
    ...l,
    coveringRef: drawable(l.coveringRef, coverage),
    siteName: drawable(l.siteName, coverage),
    unitRef: drawable(l.unitRef, coverage),
    room: drawable(l.room, coverage),
    business: {
      name: drawable(l.business.name, coverage),
      phone: l.business.phone ? drawable(l.business.phone, coverage) : null,
      email: l.business.email ? drawable(l.business.email, coverage) : null,
      licenceNumber: l.business.licenceNumber ? drawable(l.business.licenceNumber, coverage) : null,
    },
  }))

  const doc = await PDFDocument.create()
  doc.setTitle(options.title ?? `${PRODUCT_NAME} installer labels`)
  doc.setAuthor(PRODUCT_NAME)
  doc.setCreator(PRODUCT_NAME)
  doc.setProducer(PRODUCT_NAME)
  doc.setSubject('Installer labels for fitted window coverings')
  doc.setLanguage('en')
  // Sticker sheets only line up when printed at actual size.
  doc.catalog.getOrCreateViewerPreferences().setPrintScaling(PrintScaling.None)

  const allText = cleaned.flatMap(l => [l.coveringRef, l.siteName, l.unitRef, l.room, l.business.name, l.business.phone ?? '', l.business.email ?? '', l.business.licenceNumber ?? ''])
  const withExt = allText.some(text => needsExt(text, coverage))
  const faces = await embedPublicSans(doc, withExt)
  const typesetter = new Typesetter(faces, coverage)

  let page: PDFPage | null = null
  let slot = startPosition
  for (const label of cleaned) {
    if (!page || slot > slots) {
      page = doc.addPage([spec.pageWidthPt, spec.pageHeightPt])
      if (slot > slots) slot = 1
    }
    drawLabel(page, typesetter, label, options.sheet, slot)
    slot++
  }
  return doc.save()
}

// ---------------------------------------------------------------------------------------------
// Loading what goes on the labels.

interface LabelRow {
  coveringId: number
  coveringRef: string
  siteName: string
  unitRef: string
  openingRef: string
  room: string
  fittedOn: string | null
  businessName: string
  businessPhone: string | null
  businessEmail: string | null
  licenceNumber: string | null
}

// Unit U2 before U10: refs compare with their numbers as numbers.
const refOrder = new Intl.Collator('en', { numeric: true, sensitivity: 'base' })

/**
 * The label data for the given coverings, or for every covering in place on a site, in one query. The fitted
 * date is the latest fitting inspection's day (UTC, as the rulebook dates an inspection), else installed_on.
 * Callers check tenancy first: this loads whatever ids it is given.
 */
export async function labelDataForCoverings(db: Sequelize, coveringIds: number[] | { siteId: number }, appUrl: string): Promise<LabelData[]> {
  const bySite = !Array.isArray(coveringIds)
  if (!bySite && coveringIds.length === 0) return []
  const rows = await db.query<LabelRow>(`
    SELECT c.id AS "coveringId", c.ref AS "coveringRef", s.name AS "siteName", u.ref AS "unitRef", o.ref AS "openingRef", o.room,
      COALESCE(to_char(f.inspected_at AT TIME ZONE 'UTC', 'YYYY-MM-DD'), to_char(c.installed_on, 'YYYY-MM-DD')) AS "fittedOn",
      w.name AS "businessName", w.contact_phone AS "businessPhone", w.contact_email AS "businessEmail", w.licence_number AS "licenceNumber"
    FROM coverings c
    JOIN openings o ON o.id = c.opening_id
    JOIN units u ON u.id = o.unit_id
    JOIN sites s ON s.id = c.site_id
    JOIN workspaces w ON w.id = s.workspace_id
    LEFT JOIN LATERAL (
      SELECT i.inspected_at FROM inspections i WHERE i.covering_id = c.id AND i.kind = 'fitting'
      ORDER BY i.inspected_at DESC, i.id DESC LIMIT 1
    ) f ON true
    WHERE ${bySite ? `c.site_id = :siteId AND c.status = 'in_place'` : 'c.id IN (:ids)'}
    ORDER BY u.ref, o.ref, c.ref, c.id`,
  { type: QueryTypes.SELECT, replacements: bySite ? { siteId: coveringIds.siteId } : { ids: coveringIds } })

  rows.sort((a, b) => refOrder.compare(a.unitRef, b.unitRef) || refOrder.compare(a.openingRef, b.openingRef) || refOrder.compare(a.coveringRef, b.coveringRef))
  const base = appUrl.replace(/\/+$/, '')
  return rows.map(r => ({
    coveringId: r.coveringId,
    coveringRef: r.coveringRef,
    siteName: r.siteName,
    unitRef: r.unitRef,
    room: r.room,
    fittedOn: r.fittedOn,
    business: { name: r.businessName, phone: r.businessPhone, email: r.businessEmail, licenceNumber: r.licenceNumber },
    url: `${base}/coverings/${r.coveringId}`,
  }))
}
