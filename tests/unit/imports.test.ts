import { afterEach, describe, expect, it } from 'vitest'
import { checkRecord, coveringRecordSchema } from '../../rules'
import { importColumns, mapHeader, measurementAbout, measurementColumns, readCell, readRow, templateRows } from '../../shared/schemas/imports'
import { countCsvRecords } from '../../server/services/imports'
import { isRuleSetFixture, ruleSetFixture } from '../../server/services/rule-fixtures'
import { classifyChange } from '../../server/services/rechecks'
import { parseRecord, rulebookInput } from '../../server/services/inspections'

const column = (name: string) => importColumns.find(c => c.name === name)!
const value = (name: string, raw: string) => readCell(column(name), raw)

describe('import cells', () => {
  it('read lengths in mm by default, and with mm, cm, m or in (inches to a tenth of a mm, as the fitting form reads them)', () => {
    expect(value('head_height_mm', '1600')).toEqual({ value: 1600 })
    expect(value('head_height_mm', '1600mm')).toEqual({ value: 1600 })
    expect(value('head_height_mm', ' 160 cm ')).toEqual({ value: 1600 })
    expect(value('head_height_mm', '1.6m')).toEqual({ value: 1600 })
    // 63 in is 1600.2 mm; rounded to whole mm, 8.01 in (203.45 mm) would read as 203 mm, under the US 8 in (203.2 mm) limit.
    expect(value('head_height_mm', '63in')).toEqual({ value: 1600.2 })
    expect(value('head_height_mm', '63"')).toEqual({ value: 1600.2 })
    expect(value('head_height_mm', '8.01in')).toEqual({ value: 203.5 })
    expect(value('head_height_mm', '82 1/2in')).toEqual({ value: 2095.5 })
  })

  it('name what is wrong with a number: not a number, a separator, the wrong unit', () => {
    expect(value('head_height_mm', '16OO')).toEqual({ error: expect.stringMatching(/“16OO” is not a number/) })
    expect(value('head_height_mm', '1,600')).toEqual({ error: expect.stringMatching(/leave out thousands separators/) })
    expect(value('head_height_mm', '70N')).toEqual({ error: expect.stringMatching(/is a force; this column takes a length/) })
    expect(value('tension_device_hold_n', '70')).toEqual({ value: 70 })
    expect(value('tension_device_hold_n', '70 N')).toEqual({ value: 70 })
    expect(value('tension_device_hold_n', '70mm')).toEqual({ error: expect.stringMatching(/is a length; this column takes a force/) })
  })

  it('read yes/no/true/false/1/0 in any case, and an empty cell as not recorded', () => {
    for (const yes of ['yes', 'YES', 'true', 'True', '1']) expect(value('tension_device', yes)).toEqual({ value: true })
    for (const no of ['no', 'No', 'false', 'FALSE', '0']) expect(value('tension_device', no)).toEqual({ value: false })
    expect(value('tension_device', '')).toEqual({ value: null })
    expect(value('head_height_mm', '   ')).toEqual({ value: null })
    expect(value('tension_device', 'maybe')).toEqual({ error: expect.stringMatching(/not yes or no/) })
  })

  it('read enums in the trade\'s words and refuse an unknown jurisdiction', () => {
    expect(value('control', 'Chain loop')).toEqual({ value: 'chain_loop' })
    expect(value('jurisdiction', 'au')).toEqual({ value: 'AU' })
    expect(value('jurisdiction', 'NZ')).toEqual({ error: 'unknown jurisdiction “NZ”; use one of AU, CA, US, EU' })
    expect(value('installed_on', '2025-02-30')).toEqual({ error: expect.stringMatching(/not a date/) })
    expect(value('manufactured_on', '2025-02')).toEqual({ value: '2025-02' })
  })
})

describe('the import header and rows', () => {
  it('maps a header in any order and case, and names unknown or doubled columns', () => {
    const r = mapHeader(['Unit Ref', 'SITE_REF', 'Head Height (mm)'])
    expect('map' in r && r.map.map(c => c?.name)).toEqual(['unit_ref', 'site_ref', 'head_height_mm'])
    expect(mapHeader(['site_ref', 'unit_ref', 'lowst_cord'])).toEqual({ error: expect.stringMatching(/lowst_cord/) })
    expect(mapHeader(['site_ref', 'unit_ref', 'Unit-Ref'])).toEqual({ error: expect.stringMatching(/names unit_ref twice/) })
    expect(mapHeader(['site_ref'])).toEqual({ error: expect.stringMatching(/no unit_ref column/) })
  })

  it('ties columns together: a covering needs an opening, measurements need a date', () => {
    const header = mapHeader(['site_ref', 'unit_ref', 'opening_ref', 'covering_ref', 'head_height_mm', 'measured_on'])
    if (!('map' in header)) throw new Error('header')
    expect(readRow(header.map, ['S', 'U', '', 'C', '', ''])).toEqual({ problems: [{ column: 'opening_ref', message: expect.stringMatching(/a covering needs the window or door/) }] })
    expect(readRow(header.map, ['S', 'U', 'W', 'C', '2100', ''])).toEqual({ problems: [{ column: 'measured_on', message: expect.stringMatching(/give the date/) }] })
    expect(readRow(header.map, ['S', 'U', '', '', '2100', '2026-01-01'])).toEqual({ problems: [{ column: 'covering_ref', message: expect.stringMatching(/is empty, but/) }] })
    expect(readRow(header.map, ['S', 'U', 'W', 'C', '2100', '2026-01-01'])).toMatchObject({ row: { head_height_mm: 2100, measured_on: '2026-01-01', room: null } })
  })

  it('offers a column, with words, for every measured field of the rulebook record', () => {
    const own = new Set(['ref', 'jurisdiction', 'premises', 'productType', 'control', 'madeTo', 'installedOn', 'manufacturedOn', 'childrensRoom'])
    const fields = Object.keys(coveringRecordSchema.shape).filter(f => !own.has(f))
    expect(measurementColumns.map(c => c.field).sort()).toEqual(fields.sort())
    for (const f of fields) expect(measurementAbout[f as keyof typeof measurementAbout], f).toBeTruthy()
  })

  it('gives a template whose sample rows read without a problem', () => {
    const [head, ...rows] = templateRows()
    const header = mapHeader(head!)
    if (!('map' in header)) throw new Error(header.error)
    for (const r of rows) expect(readRow(header.map, r)).toHaveProperty('row')
  })

  it('gives a sample covering that is compliant under the current rules, as the import builds its record', () => {
    const [head, sample] = templateRows()
    const header = mapHeader(head!)
    if (!('map' in header)) throw new Error(header.error)
    const read = readRow(header.map, sample!)
    if (!('row' in read)) throw new Error(JSON.stringify(read.problems))
    const r = read.row
    const measurements = Object.fromEntries(measurementColumns.filter(c => r[c.name] !== null).map(c => [c.field!, r[c.name]]))
    const record = parseRecord(rulebookInput({ jurisdiction: r.jurisdiction as 'AU', premises: r.premises as string },
      { ref: r.covering_ref as string, productType: r.product_type as string, control: r.control as string, madeTo: r.made_to as string, installedOn: r.installed_on as string, manufacturedOn: r.manufactured_on as string },
      measurements, { childrensRoom: r.childrens_room as boolean }))
    expect(checkRecord(record, { today: r.measured_on as string }).verdict).toBe('compliant')
  })

  it('counts CSV records for the progress bar without parsing them', () => {
    expect(countCsvRecords(Buffer.from('a,b\r\n1,"two\nlines"\r\n\r\n3,4'))).toBe(3)
  })
})

describe('re-checks', () => {
  const before = process.env.TAUTLINE_TEST
  afterEach(() => { process.env.TAUTLINE_TEST = before })

  it('take a substituted rule set only in test mode', () => {
    process.env.TAUTLINE_TEST = '1'
    expect(isRuleSetFixture('au-loop-200')).toBe(true)
    expect(ruleSetFixture('au-loop-200').AU.version).toBe('AU-test-loop-200')
    expect(isRuleSetFixture('no-such-set')).toBe(false)
    delete process.env.TAUTLINE_TEST
    expect(isRuleSetFixture('au-loop-200')).toBe(false)
    expect(() => ruleSetFixture('au-loop-200')).toThrow(/not available outside test mode/)
  })

  it('name each change of verdict', () => {
    expect(classifyChange('compliant', 'non_compliant')).toBe('newly_failing')
    expect(classifyChange(null, 'compliant')).toBe('newly_passing')
    expect(classifyChange('compliant', 'incomplete')).toBe('now_incomplete')
    expect(classifyChange('compliant', 'not_applicable')).toBe('other')
    expect(classifyChange('incomplete', 'incomplete')).toBe('unchanged')
  })
})
