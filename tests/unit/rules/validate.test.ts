import { describe, expect, it } from 'vitest'
import { controlTypes, coveringRecordSchema, deviceFixings, fieldKinds, jurisdictions, madeToValues, parseCoveringRecord, premisesTypes, productTypes, validateRecords } from '../../../rules'
import { auBase } from './fixtures'

// The fast record parser must agree with the zod schema on every input: same verdict, same output object
// (keys in the same order), same field-named errors. Checked on generated records, valid and broken.

let seed = 0x5eed1
function random(): number {
  seed = (seed + 0x6d2b79f5) | 0
  let t = Math.imul(seed ^ (seed >>> 15), 1 | seed)
  t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t
  return ((t ^ (t >>> 14)) >>> 0) / 4294967296
}
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(random() * xs.length)]!

const fields = Object.keys(coveringRecordSchema.shape)
const oddValues: unknown[] = [undefined, null, '', ' ', 'x', '  K-1  ', 'a'.repeat(201), -1, -0, 0, 0.5, 1e9, Number.NaN, Number.POSITIVE_INFINITY, true, false, 'true', {}, [], '2024-02-29', '2023-02-29', '2024-06', '2024-13', '1899-12-31', '2024-6-01', '２０２４-01-01', 5000, 5001, 20_000, 20_001, 40_000, 40_001]

function enumValue(field: string): unknown {
  const k = fieldKinds[field as keyof typeof fieldKinds]
  if (k.k !== 'enum') return null
  const all = { jurisdiction: jurisdictions, premises: premisesTypes, productType: productTypes, control: controlTypes, madeTo: madeToValues, deviceFixing: deviceFixings }[field] ?? []
  return pick(all as readonly string[])
}

function soundValue(field: string): unknown {
  const k = fieldKinds[field as keyof typeof fieldKinds]
  switch (k.k) {
    case 'ref': return `R-${Math.floor(random() * 1000)}`
    case 'enum': return enumValue(field)
    case 'number': return random() < 0.2 ? null : Math.round(random() * Math.min(k.max, 3000) * 10) / 10
    case 'flag': return random() < 0.2 ? null : random() < 0.5
    case 'date': return random() < 0.2 ? null : k.dayRequired ? `20${10 + Math.floor(random() * 16)}-0${1 + Math.floor(random() * 9)}-1${Math.floor(random() * 9)}` : `20${10 + Math.floor(random() * 6)}-0${1 + Math.floor(random() * 9)}`
  }
}

function generate(): unknown {
  const r: Record<string, unknown> = {}
  for (const f of fields) if (random() < 0.9) r[f] = soundValue(f)
  // Break 0 to 3 fields with odd values; sometimes add an unknown key.
  const breaks = Math.floor(random() * 4)
  for (let i = 0; i < breaks; i++) r[pick(fields)] = pick(oddValues)
  if (random() < 0.1) r.extra = 'dropped'
  return r
}

describe('parseCoveringRecord agrees with coveringRecordSchema', () => {
  it('reads every field of the schema', () => {
    expect(Object.keys(fieldKinds).sort()).toEqual([...fields].sort())
  })

  it('on 20 000 generated records, valid and broken: same verdict, same output in the same key order, same errors', () => {
    let valid = 0
    let invalid = 0
    for (let i = 0; i < 20_000; i++) {
      const input = generate()
      const fast = parseCoveringRecord(input)
      const zod = coveringRecordSchema.safeParse(input)
      expect(fast.success, JSON.stringify(input)).toBe(zod.success)
      if (fast.success && zod.success) {
        valid++
        expect(fast.data).toEqual(zod.data)
        expect(Object.keys(fast.data)).toEqual(Object.keys(zod.data))
      }
      else {
        invalid++
        expect(fast.error!.issues).toEqual(zod.error!.issues)
      }
    }
    expect(valid).toBeGreaterThan(1000)
    expect(invalid).toBeGreaterThan(1000)
  })

  it('on inputs that are not records', () => {
    for (const input of [null, undefined, 'nonsense', 42, [], [auBase], true]) {
      const fast = parseCoveringRecord(input)
      const zod = coveringRecordSchema.safeParse(input)
      expect(fast.success).toBe(false)
      expect(fast.error!.issues).toEqual(zod.error!.issues)
    }
  })

  it('on the cross-field checks (lowest point and device above the headrail, installed before made)', () => {
    for (const changes of [
      { headHeightMm: 1500, lowestCordPointMm: 1600 },
      { headHeightMm: 1500, lowestCordPointMm: 900, tensionDeviceHeightMm: 1600 },
      { manufacturedOn: '2024-05', installedOn: '2024-04-30' },
      { manufacturedOn: '2024-05-20', installedOn: '2024-05-19' },
      { manufacturedOn: '2024-05', installedOn: '2024-05-01' },
      { headHeightMm: 1500, lowestCordPointMm: 1500, tensionDeviceHeightMm: 1500 },
    ]) {
      const input = { ...auBase, ...changes }
      const fast = parseCoveringRecord(input)
      const zod = coveringRecordSchema.safeParse(input)
      expect(fast.success).toBe(zod.success)
      if (!fast.success) expect(fast.error.issues).toEqual(zod.error!.issues)
      else expect(fast.data).toEqual(zod.data)
    }
  })

  it('validateRecords reports the same field-named errors through it', () => {
    const r = validateRecords([auBase, { ...auBase, ref: 'K-12', loopPullOutMm: -3, innerLoopPullOutMm: 'long' }])
    expect(r.ok).toBe(false)
    if (!r.ok) expect(r.errors.map(e => e.field)).toEqual(['loopPullOutMm', 'innerLoopPullOutMm'])
  })
})
