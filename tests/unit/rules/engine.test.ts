import { describe, expect, it } from 'vitest'
import { checkRecord, checkRecords, describeRuleSets, fail, getRuleSet, jurisdictions, pass, ruleSets } from '../../../rules'
import type { Clause, CoveringRecord, RuleSet } from '../../../rules'
import { auBase, caBase, check, euBase, rec, TODAY, usStockBase } from './fixtures'

// The engine's own behaviour; figures come from the clause tests. Sources named where a figure is used.

function deepFreeze<T>(value: T): T {
  if (value !== null && typeof value === 'object') {
    for (const v of Object.values(value)) deepFreeze(v)
    Object.freeze(value)
  }
  return value
}

describe('overall verdict', () => {
  it('any failing requirement makes the record non_compliant, even with others missing (SS2014 s 6(1)(a))', () => {
    const r = check(auBase, { tensionDevice: false, loopPullOutMm: 500, installerLabel: null })
    expect(r.verdict).toBe('non_compliant')
  })

  it('a missing value with no failure makes it incomplete, and the finding names the field (NSW summary of SS2014)', () => {
    const r = check(auBase, { installerLabel: null })
    expect(r.verdict).toBe('incomplete')
    expect(r.findings.filter(f => f.verdict === 'missing').map(f => f.field)).toEqual(['installerLabel'])
  })

  it('one finding per clause, in rule-set order, each naming its source and basis', () => {
    const r = check(auBase)
    expect(r.findings.map(f => f.clause)).toEqual(ruleSets.AU.clauses.map(c => c.id))
    for (const f of r.findings) {
      expect(f.source.length).toBeGreaterThan(5)
      expect(['published', 'secondary', 'common_practice', 'memory']).toContain(f.basis)
    }
  })

  it('every fail and missing finding says what to do', () => {
    const r = check(auBase, { tensionDevice: false, loopPullOutMm: 500, installerLabel: null, swingTag: false })
    for (const f of r.findings.filter(x => x.verdict === 'fail' || x.verdict === 'missing')) {
      expect(f.fix).toMatch(/\w{3,}/)
      expect(f.field).not.toBeNull()
    }
  })

  it('result carries ref, jurisdiction and the rule set version', () => {
    const r = check(caBase)
    expect(r).toMatchObject({ ref: 'CA-1', jurisdiction: 'CA', rulesVersion: ruleSets.CA.version })
  })
})

describe('purity and shape', () => {
  it('does not change the record it is given', () => {
    const record = deepFreeze(rec(auBase, { installedOn: null }))
    expect(() => checkRecord(record, { today: TODAY })).not.toThrow()
  })

  it('gives the same result for the same record', () => {
    const record = rec(euBase)
    expect(checkRecord(record, { today: TODAY })).toEqual(checkRecord(record, { today: TODAY }))
  })

  it('shares read-only not-applicable findings between results', () => {
    const a = check(auBase, { control: 'wand' })
    const b = check(auBase, { control: 'wand' })
    expect(a.findings[0]).toBe(b.findings[0])
    expect(Object.isFrozen(a.findings[0])).toBe(true)
  })

  it('results are plain JSON', () => {
    const r = check(usStockBase)
    expect(JSON.parse(JSON.stringify(r))).toEqual(r)
  })

  it('refuses an unvalidated record with an unknown control, naming the field', () => {
    const bad = { ...rec(auBase), control: 'rope' } as unknown as CoveringRecord
    expect(() => checkRecord(bad)).toThrow(/control "rope"/)
  })

  it('checkRecords checks each record in order with one date for the batch', () => {
    const records = [rec(auBase), rec(caBase, { ref: 'CA-2' }), rec(euBase)]
    const results = checkRecords(records, { today: TODAY })
    expect(results.map(r => r.ref)).toEqual(['AU-1', 'CA-2', 'EU-1'])
    expect(results).toEqual(records.map(r => checkRecord(r, { today: TODAY })))
  })

  it('uses the current date when `today` is not given and a date is unrecorded', () => {
    const r = checkRecord(rec(auBase, { installedOn: null, tensionDevice: false, loopPullOutMm: 500 }))
    expect(r.findings[0]!.message).toMatch(/checked as if it were \d{4}-\d{2}-\d{2}/)
  })
})

describe('substituting a rule set', () => {
  it('a bumped version and a changed clause list are used for that jurisdiction only', () => {
    const strict: Clause = {
      ...ruleSets.AU.clauses[0]!,
      thresholds: [
        { name: 'loopMinMm', value: 50, unit: 'mm' },
        { name: 'zoneTopMm', value: 1600, unit: 'mm' },
      ],
    }
    const AU: RuleSet = { ...ruleSets.AU, version: 'AU-test-2', clauses: [strict, ...ruleSets.AU.clauses.slice(1)] }
    const options = { ruleSets: { ...ruleSets, AU }, today: TODAY }
    const r = checkRecord(rec(auBase), options)
    expect(r.rulesVersion).toBe('AU-test-2')
    expect(r.verdict).toBe('non_compliant')
    expect(r.findings[0]).toMatchObject({ clause: 'au.loop-reach', verdict: 'fail', limit: 50 })
    expect(checkRecord(rec(euBase), options).rulesVersion).toBe(ruleSets.EU.version)
    expect(check(auBase).verdict).toBe('compliant')
  })

  it('a substituted advice clause can never fail a covering', () => {
    const rogue: Clause = {
      id: 'advice.rogue',
      title: 'test',
      kind: 'advice',
      source: { document: 'common practice', section: 'test' },
      basis: 'common_practice',
      appliesTo: { description: 'all', controls: ['chain_loop'] },
      thresholds: [],
      evaluate: (_r, cx) => fail(cx, null, null, null, null, 'x', 'y'),
    }
    const AU: RuleSet = { ...ruleSets.AU, clauses: [...ruleSets.AU.clauses, rogue] }
    const r = checkRecord(rec(auBase), { ruleSets: { AU }, today: TODAY })
    expect(r.findings.at(-1)!.verdict).toBe('advice')
    expect(r.verdict).toBe('compliant')
  })

  it('a rule set with only a passing clause gives compliant; none applying gives not_applicable', () => {
    const only: Clause = {
      id: 'test.only',
      title: 'test',
      kind: 'requirement',
      source: { document: 'common practice', section: 'test' },
      basis: 'common_practice',
      appliesTo: { description: 'chain loops', controls: ['chain_loop'] },
      thresholds: [],
      evaluate: (_r, cx) => pass(cx, null, null, null, null, 'ok'),
    }
    const AU: RuleSet = { ...ruleSets.AU, clauses: [only] }
    expect(checkRecord(rec(auBase), { ruleSets: { AU } }).verdict).toBe('compliant')
    expect(checkRecord(rec(auBase, { control: 'cord_loop' }), { ruleSets: { AU } }).verdict).toBe('not_applicable')
  })
})

describe('the rulebook as data (describeRuleSets)', () => {
  const described = describeRuleSets()

  it('is plain JSON in the order AU, CA, US, EU', () => {
    expect(JSON.parse(JSON.stringify(described))).toEqual(described)
    expect(described.map(s => s.jurisdiction)).toEqual([...jurisdictions])
    expect(getRuleSet('EU')).toBe(ruleSets.EU)
  })

  it('every set has a version like AU-2026.12.0 and unique clause ids', () => {
    for (const s of described) {
      expect(s.version).toMatch(new RegExp(`^${s.jurisdiction}-\\d{4}\\.\\d{1,2}\\.\\d+$`))
      const ids = s.clauses.map(c => c.id)
      expect(new Set(ids).size).toBe(ids.length)
    }
  })

  it('every clause names its source and basis; common practice has no document', () => {
    for (const s of described) {
      for (const c of s.clauses) {
        expect(c.source.document.length, c.id).toBeGreaterThan(0)
        expect(c.source.section.length, c.id).toBeGreaterThan(0)
        expect(['published', 'secondary', 'common_practice', 'memory']).toContain(c.basis)
        expect(['requirement', 'advice', 'history']).toContain(c.kind)
        if (c.basis === 'common_practice') expect(c.source.document).toBe('common practice')
        if (c.source.url !== undefined) expect(c.source.url).toMatch(/^https:\/\//)
        for (const t of c.thresholds) expect(['mm', 'in', 'N', '%', 'mg/kg', 's']).toContain(t.unit)
      }
    }
  })

  it('US keeps 16 CFR 1260 as history only', () => {
    const us = described.find(s => s.jurisdiction === 'US')!
    expect(us.clauses.filter(c => c.kind === 'history').map(c => c.id)).toEqual(['us.cfr-1260-withdrawn'])
  })

  it('EU child-safety clauses leave out offices and industrial premises; there only the child-free-premises marking applies (EN 13120+A1 scope, Hampshire Trading Standards)', () => {
    const eu = described.find(s => s.jurisdiction === 'EU')!
    for (const c of eu.clauses) {
      const premises = c.appliesTo.premises ?? []
      if (c.id === 'eu.child-free-warning') expect(premises.sort()).toEqual(['industrial', 'office'])
      else expect(premises, c.id).not.toContain('office')
    }
  })
})
