import { describe, expect, it } from 'vitest'
import { buildRecord, checkRecord, coveringRecordSchema, parseCoveringRecord, readForce, readLength } from '../../../rules'
import { liveCheck, rulebookRecord } from '../../../composables/fittingRecord'
import type { FittingContext } from '../../../composables/fittingRecord'
import { parseForce, parseLength } from '../../../composables/measure'
import { parseRecord, rulebookInput } from '../../../server/services/inspections'
import { recheckRecord } from '../../../server/services/rechecks'

// One record, built once: the fitting form (composables/fittingRecord.ts), sign-off (server/services/inspections.ts),
// the import (which calls rulebookInput) and the re-check (server/services/rechecks.ts) all go through
// rules/build.ts#buildRecord, and read typed lengths through rules/lengths.ts.

const register = {
  ref: 'BLD-1', jurisdiction: 'AU' as const, premises: 'rental_home', productType: 'roller' as const, control: 'chain_loop' as const,
  madeTo: 'custom' as const, manufacturedOn: '2025-02', installedOn: '2025-03-14',
}
const ctx: FittingContext = { ...register, childrensRoom: true }
const site = { jurisdiction: register.jurisdiction, premises: register.premises }
const covering = { ref: register.ref, productType: register.productType, control: register.control, madeTo: register.madeTo, manufacturedOn: register.manufacturedOn, installedOn: register.installedOn }
const measured = {
  headHeightMm: 2150, lowestCordPointMm: 880, loopPullOutMm: 35, tensionDevice: true, tensionDeviceHeightMm: 880, tensionDeviceHoldN: 85,
  tensionDeviceTamperProof: true, warningLabel: true, swingTag: true, installerLabel: true, installedPerInstructions: true,
}

describe('buildRecord: the browser and the server build the same record', () => {
  it('from the same register data and measurements, the fitting form and sign-off give equal records and equal verdicts', () => {
    const browser = rulebookRecord(ctx, 'chain_loop', measured)
    const server = rulebookInput(site, covering, measured, { childrensRoom: true })
    expect(browser).toEqual(server)
    const parsed = parseRecord(server)
    expect(parseCoveringRecord(browser)).toEqual({ success: true, data: parsed })
    expect(checkRecord(parsed, { today: '2026-12-02' }).verdict).toBe('compliant')
  })

  it('the register wins: a measurement never overrides the room\'s flag, the control or the covering\'s dates', () => {
    const sneaky = { ...measured, childrensRoom: false, control: 'cordless', installedOn: '2010-01-01', ref: 'OTHER', jurisdiction: 'US' }
    for (const record of [rulebookRecord(ctx, 'chain_loop', sneaky), rulebookInput(site, covering, sneaky, { childrensRoom: true })]) {
      expect(record).toMatchObject({ childrensRoom: true, control: 'chain_loop', installedOn: '2025-03-14', ref: 'BLD-1', jurisdiction: 'AU' })
    }
    // With no room known to the register, the flag is not recorded (null), never a silent no.
    expect(rulebookInput(site, covering, { childrensRoom: true }, null).childrensRoom).toBeNull()
  })

  it('a `__proto__` key in the measurements (as JSON.parse makes it) cannot reach the record\'s prototype', () => {
    const hostile = JSON.parse('{"headHeightMm": 2100, "__proto__": {"polluted": true}}') as Record<string, unknown>
    const record = buildRecord({ ...register, childrensRoom: null }, hostile) as Record<string, unknown>
    expect(Object.getPrototypeOf(record)).toBe(Object.prototype)
    expect(record.polluted).toBeUndefined()
  })

  it('the fitting form\'s live verdict is the verdict of the record sign-off saves', () => {
    const fields = Object.keys(measured).map(name => ({ name, kind: name.endsWith('Mm') ? 'length' : name.endsWith('N') ? 'force' : 'flag', label: name })) as Parameters<typeof liveCheck>[2]
    const typed = Object.fromEntries(Object.entries(measured).map(([k, v]) => [k, typeof v === 'number' ? String(v) : v]))
    const live = liveCheck(ctx, 'chain_loop', fields, typed, {})
    const saved = checkRecord(parseRecord(rulebookInput(site, covering, live.measurements, { childrensRoom: true })))
    expect(live.result?.verdict).toBe(saved.verdict)
    expect(live.result?.findings.map(f => [f.clause, f.verdict])).toEqual(saved.findings.map(f => [f.clause, f.verdict]))
  })

  it('a re-check reads the inspection\'s stored record back into the very record sign-off saved', () => {
    const saved = parseRecord(rulebookInput(site, covering, measured, { childrensRoom: true }))
    const stored = JSON.parse(JSON.stringify(saved)) as Record<string, unknown>
    expect(recheckRecord({ record: stored })).toEqual(saved)
    // A record stored before a field existed reads that field as not recorded.
    const { installedPerInstructions: _dropped, ...older } = stored
    expect(recheckRecord({ record: older }).installedPerInstructions).toBeNull()
    // A stored value the rulebook does not know is refused, not guessed (the re-check counts it as unreadable).
    expect(() => recheckRecord({ record: { ...stored, control: 'string_pull' } })).toThrow(/control/)
  })

  it('agrees with the zod schema on what it builds', () => {
    const built = buildRecord({ ...register, childrensRoom: false }, measured)
    expect(parseCoveringRecord(built)).toEqual(coveringRecordSchema.safeParse(built))
  })
})

describe('one length parser (rules/lengths.ts) for the form and the import', () => {
  it('reads millimetres, cm, m and inches (with fractions) alike in the form and in a bare call', () => {
    for (const [text, mm] of [['1600', 1600], ['1600mm', 1600], [' 160 cm ', 1600], ['1.6m', 1600], ['1.1m', 1100], ['82,5', 82.5], ['2100 mm', 2100]] as const) {
      expect(readLength(text)).toEqual({ value: mm })
      expect(parseLength(text, 'mm')).toEqual({ mm, error: null })
    }
    expect(readLength('82 1/2', 'in')).toEqual({ value: 2095.5 })
    expect(parseLength('82-1/2', 'in')).toEqual({ mm: 2095.5, error: null })
    expect(readLength('63"')).toEqual({ value: 1600.2 })
  })

  it('keeps inches to a tenth of a millimetre, so 8.01 in stays over the US 8 in (203.2 mm) limit (ANSI/WCMA A100.1)', () => {
    expect(readLength('8in')).toEqual({ value: 203.2 })
    expect(readLength('8.01in')!.value).toBeGreaterThan(203.2)
  })

  it('refuses what could be misread, saying how to write it', () => {
    expect(readLength('1,600')).toEqual({ error: expect.stringMatching(/leave out thousands separators/) })
    expect(parseLength('1,600', 'mm').error).toMatch(/leave out thousands separators/)
    expect(readLength('16OO')).toEqual({ error: expect.stringMatching(/“16OO” is not a number/) })
    expect(readLength('82 1/2')).toEqual({ error: expect.stringMatching(/fractions are for inches/) })
    expect(readLength('70N', 'mm', 'column')).toEqual({ error: expect.stringMatching(/is a force; this column takes a length/) })
    expect(readForce('70mm')).toEqual({ error: expect.stringMatching(/is a length; this field takes a force/) })
    expect(readLength('9'.repeat(41))).toEqual({ error: expect.stringMatching(/is not a number/) })
    expect(readLength('  ')).toBeNull()
  })

  it('reads forces as typed, never rounded across a limit (69.96 N is not 70 N)', () => {
    expect(readForce('70 N')).toEqual({ value: 70 })
    expect(parseForce('69.96')).toEqual({ n: 69.96, error: null })
  })
})
