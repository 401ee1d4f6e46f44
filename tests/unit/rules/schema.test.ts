import { describe, expect, it } from 'vitest'
import { coveringRecordSchema, formatRecordError, validateRecords } from '../../../rules'
import { auBase } from './fixtures'

// The input record: validation behaviour only (no published figures involved).

function issuesOf(input: unknown) {
  const r = coveringRecordSchema.safeParse(input)
  if (r.success) return []
  return r.error.issues.map(i => ({ field: i.path.join('.'), message: i.message }))
}

describe('coveringRecordSchema', () => {
  it('fills every field that was left out with null (not recorded)', () => {
    const r = coveringRecordSchema.parse({ ref: 'K', jurisdiction: 'AU', premises: 'home', productType: 'roller', control: 'wand' })
    expect(r.loopPullOutMm).toBeNull()
    expect(r.tensionDevice).toBeNull()
    expect(r.installedOn).toBeNull()
    expect(r.madeTo).toBeNull()
  })

  it('drops unknown extra fields', () => {
    const r = coveringRecordSchema.parse({ ...auBase, colour: 'blue', notes: 'x' })
    expect(r).not.toHaveProperty('colour')
    expect(r).not.toHaveProperty('notes')
  })

  it.each([
    ['jurisdiction', 'NZ'],
    ['premises', 'castle'],
    ['productType', 'awning'],
    ['control', 'rope'],
    ['madeTo', 'bespoke'],
  ])('rejects an unknown %s, naming the field and the allowed values', (field, value) => {
    const issues = issuesOf({ ...auBase, [field]: value })
    expect(issues).toHaveLength(1)
    expect(issues[0]!.field).toBe(field)
    expect(issues[0]!.message).toMatch(/must be one of/)
  })

  it.each([
    ['loopPullOutMm', -1],
    ['headHeightMm', 20_001],
    ['lowestCordPointMm', Number.NaN],
    ['cleatHeightMm', Number.POSITIVE_INFINITY],
    ['tensionDeviceHoldN', -5],
    ['tensionDeviceHoldN', 10_000],
    ['freeCordLengthMm', '300'],
  ])('rejects an impossible %s (%s), naming the field', (field, value) => {
    const issues = issuesOf({ ...auBase, [field]: value })
    expect(issues.map(i => i.field)).toEqual([field])
  })

  it('rejects a boolean field given as text', () => {
    expect(issuesOf({ ...auBase, breakaway: 'yes' }).map(i => i.field)).toEqual(['breakaway'])
  })

  it('accepts 0 mm and decimals', () => {
    expect(issuesOf({ ...auBase, loopPullOutMm: 0, tensionDeviceHoldN: 70.5 })).toEqual([])
  })

  it('checks dates are real: 29 Feb in a leap year only; manufacture may be a month', () => {
    expect(issuesOf({ ...auBase, installedOn: '2024-02-29' })).toEqual([])
    expect(issuesOf({ ...auBase, installedOn: '2023-02-29' }).map(i => i.field)).toEqual(['installedOn'])
    expect(issuesOf({ ...auBase, installedOn: '2024-06' }).map(i => i.field)).toEqual(['installedOn'])
    expect(issuesOf({ ...auBase, manufacturedOn: '2023-13' }).map(i => i.field)).toEqual(['manufacturedOn'])
    expect(issuesOf({ ...auBase, manufacturedOn: '2023-06' })).toEqual([])
    expect(issuesOf({ ...auBase, manufacturedOn: '2023-06-31' }).map(i => i.field)).toEqual(['manufacturedOn'])
  })

  it('rejects a lowest cord point above the headrail, and a device above it', () => {
    expect(issuesOf({ ...auBase, headHeightMm: 1500, lowestCordPointMm: 1600 }).map(i => i.field)).toEqual(['lowestCordPointMm'])
    expect(issuesOf({ ...auBase, headHeightMm: 1500, lowestCordPointMm: 900, tensionDeviceHeightMm: 1600 }).map(i => i.field)).toEqual([
      'tensionDeviceHeightMm',
    ])
  })

  it('rejects an installation before manufacture, by month when only the month is known', () => {
    expect(issuesOf({ ...auBase, manufacturedOn: '2024-05', installedOn: '2024-04-30' }).map(i => i.field)).toEqual(['installedOn'])
    expect(issuesOf({ ...auBase, manufacturedOn: '2024-05', installedOn: '2024-05-01' })).toEqual([])
    expect(issuesOf({ ...auBase, manufacturedOn: '2024-05-20', installedOn: '2024-05-19' }).map(i => i.field)).toEqual(['installedOn'])
  })

  it('requires ref, jurisdiction, premises, productType and control', () => {
    const fields = issuesOf({}).map(i => i.field)
    expect(fields.sort()).toEqual(['control', 'jurisdiction', 'premises', 'productType', 'ref'])
  })
})

describe('validateRecords', () => {
  it('returns parsed records when all are valid', () => {
    const r = validateRecords([auBase, { ...auBase, ref: 'AU-2' }])
    expect(r.ok).toBe(true)
    if (r.ok) expect(r.records.map(x => x.ref)).toEqual(['AU-1', 'AU-2'])
  })

  it('names the record index, its ref and the field of every error', () => {
    const r = validateRecords([auBase, { ...auBase, ref: 'K-12', loopPullOutMm: -3 }, 'nonsense'])
    expect(r.ok).toBe(false)
    if (r.ok) return
    expect(r.errors[0]).toMatchObject({ index: 1, ref: 'K-12', field: 'loopPullOutMm' })
    expect(formatRecordError(r.errors[0]!)).toBe('record 1 (ref "K-12"): loopPullOutMm: must be at least 0 mm')
    expect(r.errors[1]).toMatchObject({ index: 2, ref: null, field: '' })
  })

  it('refuses input that is not an array', () => {
    const r = validateRecords({ ref: 'x' })
    expect(r.ok).toBe(false)
    if (!r.ok) expect(formatRecordError(r.errors[0]!)).toMatch(/^input: input must be an array/)
  })
})
