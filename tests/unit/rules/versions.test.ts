import { createHash } from 'node:crypto'
import { describe, expect, it } from 'vitest'
import { describeRuleSets } from '../../../rules'
import type { RuleSetDescription } from '../../../rules'

// A change to any clause's id, kind, basis, source, scope of application or threshold must come with a new
// rule-set version, because stored results name the version they were checked under.

/** The version each rule set's clause data was last released under, and that data's fingerprint. */
const RELEASED: Record<string, string> = {
  'AU-2026.12.0': '68274f39edd43693',
  'CA-2026.12.0': '5b1ef9ae24069e87',
  'US-2026.12.0': '479479fd75aa1207',
  'EU-2026.12.0': 'd083220ad3e5a2d2',
  // AU: pull-out read as measured, cord guides of every kind, inner and rear cords, installed per instructions,
  // installation by a business, the Standard's own provisions cited.
  // US: exact 8 in, stock loops, inner loops, maker's label on every covering, longest cord, edition dates,
  // 2022 edition as secondary, warning label and tag, tilt cords, connectors, factory-fitted tension devices.
  'AU-2026.12.1': '1950f7e090622612',
  'US-2026.12.1': 'dc5fdff537e4dd5e',
  // CA: longest cord, perimeter bounds the span, inner cords out of reach (s 4), information on SOR/2019-97,
  // bilingual information.
  'CA-2026.12.1': '2842590e4e122e08',
  // EU: working tension devices only, inner cords, cleat height, child-free marking, longest cord, A1 date,
  // Commission decisions and Regulation (EU) 2023/988 cited.
  'EU-2026.12.1': 'fdeb2bde8aef2471',
}

/** JSON with object keys sorted, so the fingerprint does not depend on key order. */
function canonical(value: unknown): string {
  if (Array.isArray(value)) return `[${value.map(canonical).join(',')}]`
  if (value !== null && typeof value === 'object') {
    const entries = Object.entries(value as Record<string, unknown>).filter(([, v]) => v !== undefined)
    entries.sort(([a], [b]) => (a < b ? -1 : a > b ? 1 : 0))
    return `{${entries.map(([k, v]) => `${JSON.stringify(k)}:${canonical(v)}`).join(',')}}`
  }
  return JSON.stringify(value)
}

/** Fingerprint of what decides verdicts: wording (titles, notes, descriptions) is left out. */
function fingerprint(set: RuleSetDescription): string {
  const data = {
    jurisdiction: set.jurisdiction,
    premises: set.scope.premises,
    clauses: set.clauses.map(c => ({
      id: c.id,
      kind: c.kind,
      basis: c.basis,
      source: c.source,
      appliesTo: { ...c.appliesTo, description: undefined },
      thresholds: c.thresholds.map(t => ({ name: t.name, value: t.value, unit: t.unit })),
    })),
  }
  return createHash('sha256').update(canonical(data)).digest('hex').slice(0, 16)
}

describe('rule set versions', () => {
  for (const set of describeRuleSets()) {
    it(`${set.jurisdiction} ${set.version} matches its released clause data`, () => {
      const now = fingerprint(set)
      expect(
        RELEASED[set.version],
        `${set.jurisdiction} clause data changed (fingerprint ${now}). Bump the version in rules/sets/${set.jurisdiction.toLowerCase()}.ts `
        + `(e.g. ${set.version.replace(/\.(\d+)$/, (_, n: string) => `.${Number(n) + 1}`)}) and add '<new version>': '${now}' to RELEASED in this file.`,
      ).toBe(now)
    })
  }

  it('no two releases share a version string', () => {
    const versions = describeRuleSets().map(s => s.version)
    expect(new Set(versions).size).toBe(versions.length)
  })
})
