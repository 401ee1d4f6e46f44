import { spawnSync } from 'node:child_process'
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { afterAll, describe, expect, it } from 'vitest'

// The command-line check: `tsx scripts/check.ts FILE.json | -`. Figures from SS2014 s 6(1)(a) (220 mm loop, 1600 mm zone).

const root = resolve(import.meta.dirname, '../../..')
const tsx = join(root, 'node_modules/.bin/tsx')
const dir = mkdtempSync(join(tmpdir(), 'tautline-check-'))
afterAll(() => rmSync(dir, { recursive: true, force: true }))

function run(args: string[], input?: string) {
  const r = spawnSync(tsx, ['scripts/check.ts', ...args], { cwd: root, input, encoding: 'utf8', timeout: 60_000 })
  return { code: r.status, stdout: r.stdout, stderr: r.stderr }
}

const records = [
  {
    ref: 'K-1',
    jurisdiction: 'AU',
    premises: 'rental_home',
    installedOn: '2025-04-02',
    productType: 'roller',
    control: 'chain_loop',
    headHeightMm: 2100,
    lowestCordPointMm: 900,
    loopPullOutMm: 450,
    tensionDevice: false,
    warningLabel: true,
    swingTag: true,
    installerLabel: true,
    unknownExtra: 'ignored',
  },
  { ref: 'K-2', jurisdiction: 'EU', premises: 'office', productType: 'roller', control: 'wand' },
]

describe('scripts/check.ts', { timeout: 60_000 }, () => {
  it('checks records from a file and prints results as JSON, exit 0 (SS2014 s 6(1)(a): 450 mm loop at 900 mm fails)', () => {
    const file = join(dir, 'records.json')
    writeFileSync(file, JSON.stringify(records))
    const r = run([file, '--today', '2026-12-01'])
    expect(r.stderr).toBe('')
    expect(r.code).toBe(0)
    const results = JSON.parse(r.stdout)
    expect(results).toHaveLength(2)
    expect(results[0]).toMatchObject({ ref: 'K-1', jurisdiction: 'AU', verdict: 'non_compliant' })
    expect(results[0].rulesVersion).toMatch(/^AU-/)
    expect(results[0].findings[0]).toMatchObject({ clause: 'au.loop-reach', verdict: 'fail', measured: 450, limit: 220, unit: 'mm' })
    expect(results[1]).toMatchObject({ ref: 'K-2', verdict: 'not_applicable' })
  })

  it('reads standard input when the file is -', () => {
    const r = run(['-', '--today', '2026-12-01'], JSON.stringify(records.slice(0, 1)))
    expect(r.code).toBe(0)
    expect(JSON.parse(r.stdout)[0].ref).toBe('K-1')
  })

  it('prints an empty array for an empty array', () => {
    const r = run(['-'], '[]')
    expect(r.code).toBe(0)
    expect(JSON.parse(r.stdout)).toEqual([])
  })

  it('exits 2 naming the record index, its ref and the field for invalid records', () => {
    const bad = [records[0], { ...records[0], ref: 'K-9', loopPullOutMm: -4 }, { ...records[0], ref: 'K-10', control: 'rope' }]
    const r = run(['-'], JSON.stringify(bad))
    expect(r.code).toBe(2)
    expect(r.stdout).toBe('')
    expect(r.stderr).toContain('record 1 (ref "K-9"): loopPullOutMm: must be at least 0 mm')
    expect(r.stderr).toMatch(/record 2 \(ref "K-10"\): control: must be one of/)
  })

  it('exits 2 for text that is not JSON, input that is not an array, a missing file, or no argument', () => {
    expect(run(['-'], '{nope').code).toBe(2)
    const notArray = run(['-'], '{"ref":"x"}')
    expect(notArray.code).toBe(2)
    expect(notArray.stderr).toMatch(/must be an array/)
    const missing = run([join(dir, 'absent.json')])
    expect(missing.code).toBe(2)
    expect(missing.stderr).toMatch(/cannot read/)
    expect(run([]).code).toBe(2)
  })
})
