// Throughput of the check engine: `npx tsx scripts/bench/rules.ts [count]`. Prints figures; never fails on time.
import { checkRecord, controlTypes, corded, coveringRecordSchema, jurisdictions, premisesTypes, productTypes } from '../../rules/index'
import type { CheckOptions, CoveringRecord, OverallVerdict } from '../../rules/index'

const GOAL_PER_SECOND = 500_000
const count = Number(process.argv[2] ?? 1_000_000)
if (!Number.isInteger(count) || count <= 0) {
  console.error('usage: tsx scripts/bench/rules.ts [count]')
  process.exit(2)
}

// Seeded generator so every run checks the same records.
let seed = 0x7a17
function random(): number {
  seed = (seed + 0x6d2b79f5) | 0
  let t = Math.imul(seed ^ (seed >>> 15), 1 | seed)
  t = (t + Math.imul(t ^ (t >>> 7), 61 | t)) ^ t
  return ((t ^ (t >>> 14)) >>> 0) / 4294967296
}
const pick = <T>(xs: readonly T[]): T => xs[Math.floor(random() * xs.length)]!
const maybe = <T>(value: T, nullShare = 0.1): T | null => (random() < nullShare ? null : value)
const mm = (lo: number, hi: number) => Math.round(lo + random() * (hi - lo))
const flag = (trueShare = 0.7) => maybe(random() < trueShare)
const days = Array.from({ length: 28 }, (_, i) => String(i + 1).padStart(2, '0'))
const months = Array.from({ length: 12 }, (_, i) => String(i + 1).padStart(2, '0'))
const date = (fromYear: number, toYear: number) => `${mm(fromYear, toYear)}-${pick(months)}-${pick(days)}`

function generate(i: number): CoveringRecord {
  const head = mm(900, 3200)
  const lowest = Math.min(head, mm(0, 2400))
  const made = maybe(random() < 0.5 ? `${mm(2012, 2026)}-${pick(months)}` : date(2012, 2026))
  const installed = made === null ? maybe(date(2008, 2026)) : maybe(`${made.slice(0, 4)}-12-31`)
  const tension = flag(0.5)
  return {
    ref: `B-${i}`,
    jurisdiction: pick(jurisdictions),
    premises: pick(premisesTypes),
    installedOn: installed,
    manufacturedOn: made,
    madeTo: maybe(random() < 0.5 ? 'stock' : 'custom'),
    productType: pick(productTypes),
    control: random() < 0.8 ? pick(corded) : pick(controlTypes),
    headHeightMm: maybe(head, 0.05),
    productHeightMm: maybe(mm(500, 3000)),
    lowestCordPointMm: maybe(lowest),
    loopPullOutMm: maybe(mm(0, 600)),
    loopPerimeterMm: maybe(mm(0, 1200), 0.5),
    freeCordLengthMm: maybe(mm(0, 1500)),
    operatingCordLengthMm: maybe(mm(0, 1500)),
    rearCordSpacingMm: maybe(mm(100, 400)),
    innerCordStops: flag(),
    tensionDevice: tension,
    tensionDeviceHeightMm: maybe(Math.min(head, mm(300, 2000))),
    tensionDeviceHoldN: maybe(mm(20, 150)),
    tensionDeviceTamperProof: flag(),
    cleat: flag(0.3),
    cleatHeightMm: maybe(Math.min(head, mm(800, 2000))),
    breakaway: flag(0.4),
    warningLabel: flag(0.8),
    swingTag: flag(0.8),
    installerLabel: flag(0.8),
    manufacturerLabel: flag(0.9),
    climbableFurnitureNearby: flag(0.3),
    childrensRoom: flag(0.2),
    cordSpanMm: maybe(mm(50, 500)),
    jointFreeCordsMm: maybe(mm(0, 400)),
    innerCordsReachable: flag(0.5),
    longerCordRequested: flag(0.3),
  }
}

const mb = (bytes: number) => (bytes / 1024 / 1024).toFixed(0)
let peakHeap = 0
const sampleHeap = () => {
  const used = process.memoryUsage().heapUsed
  if (used > peakHeap) peakHeap = used
}

console.log(`Generating ${count.toLocaleString('en')} records over ${jurisdictions.join(', ')}...`)
const records: CoveringRecord[] = new Array(count)
for (let i = 0; i < count; i++) records[i] = generate(i)
sampleHeap()
console.log(`  heap after generation: ${mb(process.memoryUsage().heapUsed)} MB`)

const options: CheckOptions = { today: '2026-12-01' }
const tally: Record<OverallVerdict, number> = { compliant: 0, non_compliant: 0, incomplete: 0, not_applicable: 0 }
let findingsSeen = 0

// Warm-up so the timed run measures optimised code.
for (let i = 0; i < Math.min(count, 50_000); i++) checkRecord(records[i]!, options)

const SAMPLE_EVERY = 65_536
let start = process.hrtime.bigint()
for (let i = 0; i < count; i++) {
  const result = checkRecord(records[i]!, options)
  tally[result.verdict]++
  findingsSeen += result.findings.length
  if ((i & (SAMPLE_EVERY - 1)) === 0) sampleHeap()
}
const checkSeconds = Number(process.hrtime.bigint() - start) / 1e9
sampleHeap()
const checkRate = count / checkSeconds

start = process.hrtime.bigint()
for (let i = 0; i < count; i++) {
  const parsed = coveringRecordSchema.parse(records[i])
  checkRecord(parsed, options)
  if ((i & (SAMPLE_EVERY - 1)) === 0) sampleHeap()
}
const zodSeconds = Number(process.hrtime.bigint() - start) / 1e9
sampleHeap()
const zodRate = count / zodSeconds

const fmt = (n: number) => Math.round(n).toLocaleString('en')
console.log('')
console.log(`checkRecord on validated records (one thread):`)
console.log(`  ${fmt(count)} records in ${checkSeconds.toFixed(2)} s = ${fmt(checkRate)} records/s`)
console.log(`  goal ${fmt(GOAL_PER_SECOND)} records/s: ${(checkRate / GOAL_PER_SECOND).toFixed(2)}x the goal (${checkRate >= GOAL_PER_SECOND ? 'met' : 'NOT met'})`)
console.log(`  ${fmt(findingsSeen / count)} findings per record on average`)
console.log(`  verdicts: ${Object.entries(tally).map(([k, v]) => `${k} ${fmt(v)}`).join(', ')}`)
console.log(`zod validation + checkRecord:`)
console.log(`  ${fmt(count)} records in ${zodSeconds.toFixed(2)} s = ${fmt(zodRate)} records/s (${(zodRate / checkRate).toFixed(2)}x the check-only rate)`)
console.log(`memory:`)
console.log(`  peak RSS ${mb(process.resourceUsage().maxRSS * 1024)} MB; peak heap used ${mb(peakHeap)} MB (includes the ${fmt(count)} generated records)`)
