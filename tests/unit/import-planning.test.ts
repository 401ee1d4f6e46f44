import { describe, expect, it } from 'vitest'
import { hasMeasurements, importColumnByName, mapHeader, normaliseHeader, readCell, readRow } from '../../shared/schemas/imports'
import type { HeaderMap } from '../../shared/schemas/imports'
import { scanCsv } from '../../server/services/imports'

// The pure steps an import plans each row with: the header map, reading each cell, and the row's own rules.
// Matching rows to what is already stored (ImportBatcher) reads the database and is covered by tests/api/imports.test.ts.

const cell = (name: string, raw: string | undefined) => readCell(importColumnByName.get(name)!, raw)
function headerOf(names: string[]): HeaderMap {
  const r = mapHeader(names)
  if ('error' in r) throw new Error(r.error)
  return r.map
}

describe('header mapping', () => {
  it('reads a byte-order mark, spaces, dashes, dots and a unit in brackets as the column name', () => {
    expect(normaliseHeader('\uFEFFsite_ref')).toBe('site_ref')
    expect(normaliseHeader('  Head Height (mm) ')).toBe('head_height_mm')
    expect(normaliseHeader('TENSION-DEVICE-HOLD (N)')).toBe('tension_device_hold_n')
    expect(normaliseHeader('unit.ref')).toBe('unit_ref')
    expect(normaliseHeader('__unit__ref__')).toBe('unit_ref')
  })

  it('leaves an empty header cell unmapped, so its column is ignored', () => {
    expect(headerOf(['site_ref', '', 'unit_ref']).map(c => c?.name ?? null)).toEqual(['site_ref', null, 'unit_ref'])
  })

  it('names at most five unknown columns, then an ellipsis', () => {
    const r = mapHeader(['site_ref', 'unit_ref', 'a1', 'a2', 'a3', 'a4', 'a5', 'a6'])
    expect(r).toEqual({ error: 'the header has columns the template does not know: a1, a2, a3, a4, a5…; check the spelling against the template' })
    expect(mapHeader(['site_ref', 'unit_ref', 'colour'])).toEqual({ error: expect.stringMatching(/^the header has a column the template does not know: colour;/) })
  })

  it('refuses a header without site_ref', () => {
    expect(mapHeader(['unit_ref'])).toEqual({ error: expect.stringMatching(/no site_ref column/) })
  })
})

describe('reading cells', () => {
  it('refuses a line break, tab or other control character in a text cell, and text over its length', () => {
    for (const raw of ['Flat\n2', 'Flat\r2', 'Flat\t2', 'Flat\u00002', 'Flat\u007F2']) {
      expect(cell('unit_name', raw)).toEqual({ error: expect.stringMatching(/control character/) })
    }
    expect(cell('unit_name', 'x'.repeat(120))).toEqual({ value: 'x'.repeat(120) })
    expect(cell('unit_name', 'x'.repeat(121))).toEqual({ error: 'is longer than 120 characters' })
    expect(cell('address', 'x'.repeat(301))).toEqual({ error: 'is longer than 300 characters' })
  })

  it('trims a cell before reading it, so surrounding spaces and line ends are not problems', () => {
    expect(cell('unit_name', '  Flat 2 \r\n')).toEqual({ value: 'Flat 2' })
    expect(cell('unit_name', undefined)).toEqual({ value: null })
  })

  it('takes refs of letters, digits, spaces and . - / # up to 60 characters, and quotes a bad one shortened', () => {
    expect(cell('site_ref', 'Block A/12-3 #4.b')).toEqual({ value: 'Block A/12-3 #4.b' })
    expect(cell('site_ref', 'x'.repeat(60))).toEqual({ value: 'x'.repeat(60) })
    expect(cell('site_ref', 'x'.repeat(61))).toEqual({ error: 'is longer than 60 characters' })
    expect(cell('site_ref', 'A;B')).toEqual({ error: '“A;B” may hold letters, digits, spaces and . - / # only' })
    expect(cell('site_ref', `${'y'.repeat(45)}!`)).toEqual({ error: `“${'y'.repeat(40)}…” may hold letters, digits, spaces and . - / # only` })
  })

  it('reads real calendar dates only: leap days, month lengths, years 1900 to 2100', () => {
    expect(cell('installed_on', '2024-02-29')).toEqual({ value: '2024-02-29' })
    expect(cell('installed_on', '2000-02-29')).toEqual({ value: '2000-02-29' })
    for (const bad of ['2025-02-29', '1900-02-29', '2025-04-31', '2025-13-01', '2025-00-10', '2025-01-00', '1899-12-31', '2101-01-01', '2025-1-5', '05/01/2025']) {
      expect(cell('installed_on', bad), bad).toEqual({ error: expect.stringMatching(/is not a date written YYYY-MM-DD/) })
    }
    expect(cell('installed_on', '2025-02')).toEqual({ error: expect.stringMatching(/not a date written YYYY-MM-DD/) })
    expect(cell('manufactured_on', '2025-02-28')).toEqual({ value: '2025-02-28' })
    expect(cell('manufactured_on', '2025-13')).toEqual({ error: expect.stringMatching(/not a date written YYYY-MM or YYYY-MM-DD/) })
  })

  it('reads a length written in metres or centimetres as millimetres', () => {
    expect(cell('lowest_cord_point_mm', '1.55 m')).toEqual({ value: 1550 })
    expect(cell('lowest_cord_point_mm', '88cm')).toEqual({ value: 880 })
  })

  it('reads enums with spaces or dashes for underscores, and names the allowed values', () => {
    expect(cell('premises', 'Rental-Home')).toEqual({ value: 'rental_home' })
    expect(cell('product_type', 'curtain rod')).toEqual({ error: expect.stringMatching(/^unknown product type “curtain rod”; use one of /) })
  })
})

describe('planning a row', () => {
  const map = headerOf(['site_ref', 'unit_ref', 'unit_name', 'opening_ref', 'room', 'childrens_room', 'covering_ref', 'measured_on', 'tension_device', 'lowest_cord_point_mm'])

  it('gives every template column, null where the file says nothing', () => {
    const read = readRow(map, ['S1', 'U1', '', '', '', '', '', '', '', ''])
    if (!('row' in read)) throw new Error(JSON.stringify(read.problems))
    expect(read.row.site_ref).toBe('S1')
    expect(read.row.unit_name).toBeNull()
    expect(read.row.head_height_mm).toBeNull()
    expect(hasMeasurements(read.row)).toBe(false)
  })

  it('lists every unreadable cell by column before checking the rules between columns', () => {
    expect(readRow(map, ['', 'U1', 'Flat\n1', '', '', 'perhaps', '', '', '', 'far'])).toEqual({ problems: [
      { column: 'unit_name', message: expect.stringMatching(/control character/) },
      { column: 'childrens_room', message: expect.stringMatching(/not yes or no/) },
      { column: 'lowest_cord_point_mm', message: expect.stringMatching(/not a number/) },
    ] })
  })

  it('names an empty site_ref and unit_ref together', () => {
    expect(readRow(map, ['', '', '', '', '', '', '', '', '', ''])).toEqual({ problems: [
      { column: 'site_ref', message: 'is empty; every row names its site' },
      { column: 'unit_ref', message: 'is empty; every row names its unit' },
    ] })
  })

  it('asks for the opening when a room or child\'s room is given without one', () => {
    expect(readRow(map, ['S1', 'U1', '', '', 'Bedroom', '', '', '', '', ''])).toEqual({ problems: [{ column: 'opening_ref', message: 'is empty, but room is given' }] })
    expect(readRow(map, ['S1', 'U1', '', '', 'Bedroom', 'yes', '', '', '', ''])).toEqual({ problems: [{ column: 'opening_ref', message: 'is empty, but room and childrens_room are given' }] })
  })

  it('refuses measurements dated in the future', () => {
    const next = `${new Date().getUTCFullYear() + 1}-01-01`
    expect(readRow(map, ['S1', 'U1', '', 'W1', '', '', 'C1', next, 'yes', '900'])).toEqual({ problems: [{ column: 'measured_on', message: `${next} is in the future` }] })
  })

  it('makes a measured covering an inspection, and a covering without measurements a register row only', () => {
    const measured = readRow(map, ['S1', 'U1', '', 'W1', '', '', 'C1', '2026-01-20', 'no', '900mm'])
    if (!('row' in measured)) throw new Error(JSON.stringify(measured.problems))
    expect(measured.row).toMatchObject({ tension_device: false, lowest_cord_point_mm: 900, measured_on: '2026-01-20' })
    expect(hasMeasurements(measured.row)).toBe(true)
    const bare = readRow(map, ['S1', 'U1', '', 'W1', '', '', 'C1', '', '', ''])
    if (!('row' in bare)) throw new Error(JSON.stringify(bare.problems))
    expect(hasMeasurements(bare.row)).toBe(false)
  })

  it('ignores empty cells past the header, and names a row with more filled cells than columns', () => {
    expect(readRow(map, ['S1', 'U1', '', '', '', '', '', '', '', '', ' ', ''])).toHaveProperty('row')
    expect(readRow(map, ['S1', 'U1', '', '', '', '', '', '', '', '', 'extra'])).toEqual({ problems: [{ column: '', message: 'the row has 11 cells but the header names 10 columns' }] })
  })
})

describe('scanning the file for the progress bar', () => {
  it('counts records outside quotes and reports the line where a quoted cell never closes', () => {
    expect(scanCsv(Buffer.from('site_ref,unit_ref\nS1,U1\n\nS1,U2\n'))).toEqual({ records: 3, unclosedQuoteLine: undefined })
    expect(scanCsv(Buffer.from('site_ref,unit_name\nS1,"Flat\n2"\nS1,"open\nS2,x'))).toEqual({ records: 3, unclosedQuoteLine: 4 })
  })
})
