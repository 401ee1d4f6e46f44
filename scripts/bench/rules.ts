// Throughput of the check engine: `npx tsx scripts/bench/rules.ts [count]`. Prints figures; never fails on time.
import { availableParallelism, loadavg } from 'node:os'
import { checkRecord, controlTypes, corded, coveringRecordSchema, jurisdictions, parseCoveringRecord, premisesTypes, productTypes } from '../../rules/index'
import type { CheckOptions, CoveringRecord, OverallVerdict } from '../../rules/index'

const GOAL_PER_SECOND = 500_000
const VALIDATED_GOAL_PER_SECOND = 200_000
const count = Number(process.argv[2] ?? 1_000_000)
if (!Number.isInteger(count) || count <= 0) {
  console.error('usage: tsx scripts/bench/rules.ts [count]')
  process.exit(2)
}

// Seeded generator so every run checks the same records.
const FIRST_SEED = 0x7a17
let seed = FIRST_SEED
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
    deviceFixing: maybe(pick(['timber', 'masonry_plugs', 'plasterboard_anchor', 'metal_frame', 'adhesive'] as const), 0.3),
    longerCordRequested: flag(0.3),
    innerLoopPullOutMm: maybe(mm(0, 400), 0.3),
    innerCordLoop: flag(0.2),
    operatingCordsInaccessible: flag(0.3),
    tensionDeviceHoldsTaut: flag(0.8),
    tensionDeviceFactoryFitted: flag(0.7),
    operatesWithoutTensionDevice: flag(0.2),
    freeTiltCord: flag(0.2),
    multiCordConnector: flag(0.1),
    installedPerInstructions: flag(0.9),
    installedByBusiness: flag(0.9),
    childFreePremisesWarning: flag(0.5),
    bilingualInformation: flag(0.8),
  }
}

const mb = (bytes: number) => (bytes / 1024 / 1024).toFixed(0)
const fmt = (n: number) => Math.round(n).toLocaleString('en')
let peakHeap = 0
const sampleHeap = () => {
  const used = process.memoryUsage().heapUsed
  if (used > peakHeap) peakHeap = used
}

// Records are generated in chunks (untimed) so memory holds one chunk, not a million records.
const CHUNK = 100_000
const options: CheckOptions = { today: '2026-12-01' }
const tally: Record<OverallVerdict, number> = { compliant: 0, non_compliant: 0, incomplete: 0, not_applicable: 0 }
const byJurisdiction: Record<string, number> = {}
let findingsSeen = 0
let checkWall = 0
let checkCpu = 0
let zodWall = 0
let zodCpu = 0
let fastWall = 0
let fastCpu = 0
const chunkRates: number[] = []

function timed(run: () => void): { wall: number, cpu: number } {
  const cpu0 = process.cpuUsage()
  const t0 = process.hrtime.bigint()
  run()
  const wall = Number(process.hrtime.bigint() - t0) / 1e9
  const cpu = process.cpuUsage(cpu0)
  return { wall, cpu: (cpu.user + cpu.system) / 1e6 }
}

// Warm-up so the timed runs measure optimised code.
{
  const warm: CoveringRecord[] = []
  seed = 0x5eed
  for (let i = 0; i < 50_000; i++) warm.push(generate(-1 - i))
  for (const r of warm) {
    checkRecord(coveringRecordSchema.parse(r), options)
    const parsed = parseCoveringRecord(r)
    if (parsed.success) checkRecord(parsed.data, options)
  }
}

// Two passes over the same records (the generator is reseeded): check only, then validation plus check, so
// the garbage zod leaves behind does not land in the check-only figures.
console.log(`Checking ${fmt(count)} generated records over ${jurisdictions.join(', ')} in chunks of ${fmt(CHUNK)}...`)
seed = FIRST_SEED
for (let done = 0; done < count; done += CHUNK) {
  const size = Math.min(CHUNK, count - done)
  const records: CoveringRecord[] = new Array(size)
  for (let i = 0; i < size; i++) records[i] = generate(done + i)
  sampleHeap()
  const check = timed(() => {
    for (let i = 0; i < size; i++) {
      const result = checkRecord(records[i]!, options)
      tally[result.verdict]++
      byJurisdiction[result.jurisdiction] = (byJurisdiction[result.jurisdiction] ?? 0) + 1
      findingsSeen += result.findings.length
    }
  })
  checkWall += check.wall
  checkCpu += check.cpu
  chunkRates.push(size / check.wall)
  sampleHeap()
}

// Validation with the rulebook's own parser (parseCoveringRecord: the fast path, zod only for errors) plus check.
seed = FIRST_SEED
let rejected = 0
for (let done = 0; done < count; done += CHUNK) {
  const size = Math.min(CHUNK, count - done)
  const records: unknown[] = new Array(size)
  for (let i = 0; i < size; i++) records[i] = generate(done + i)
  const withParser = timed(() => {
    for (let i = 0; i < size; i++) {
      const parsed = parseCoveringRecord(records[i])
      if (parsed.success) checkRecord(parsed.data, options)
      else rejected++
    }
  })
  fastWall += withParser.wall
  fastCpu += withParser.cpu
  sampleHeap()
}

seed = FIRST_SEED
for (let done = 0; done < count; done += CHUNK) {
  const size = Math.min(CHUNK, count - done)
  const records: unknown[] = new Array(size)
  for (let i = 0; i < size; i++) records[i] = generate(done + i)
  const withZod = timed(() => {
    for (let i = 0; i < size; i++) checkRecord(coveringRecordSchema.parse(records[i]), options)
  })
  zodWall += withZod.wall
  zodCpu += withZod.cpu
  sampleHeap()
}

chunkRates.sort((a, b) => a - b)
const checkRate = count / checkWall
const checkCpuRate = count / checkCpu
const medianChunk = chunkRates[Math.floor(chunkRates.length / 2)]!
const zodRate = count / zodWall
const verdict = (rate: number) => `${(rate / GOAL_PER_SECOND).toFixed(2)}x the goal (${rate >= GOAL_PER_SECOND ? 'met' : 'NOT met'})`

console.log('')
console.log('checkRecord on validated records (JavaScript runs on one thread):')
console.log(`  wall clock: ${fmt(count)} records in ${checkWall.toFixed(2)} s = ${fmt(checkRate)} records/s, ${verdict(checkRate)}`)
console.log(`  median chunk: ${fmt(medianChunk)} records/s; slowest ${fmt(chunkRates[0]!)}, fastest ${fmt(chunkRates[chunkRates.length - 1]!)}`)
console.log(`  CPU time: ${checkCpu.toFixed(2)} s = ${fmt(checkCpuRate)} records per CPU-second, ${verdict(checkCpuRate)}`)
console.log(`  goal: ${fmt(GOAL_PER_SECOND)} records/s on one core`)
console.log(`  ${(findingsSeen / count).toFixed(1)} findings per record on average`)
console.log(`  verdicts: ${Object.entries(tally).map(([k, v]) => `${k} ${fmt(v)}`).join(', ')}`)
console.log(`  jurisdictions: ${Object.entries(byJurisdiction).map(([k, v]) => `${k} ${fmt(v)}`).join(', ')}`)
const fastRate = count / fastWall
const fastCpuRate = count / fastCpu
const validatedVerdict = (rate: number) => `${(rate / VALIDATED_GOAL_PER_SECOND).toFixed(2)}x the goal (${rate >= VALIDATED_GOAL_PER_SECOND ? 'met' : 'NOT met'})`
console.log('parseCoveringRecord + checkRecord (validation and check, one thread):')
console.log(`  wall clock: ${fmt(count)} records in ${fastWall.toFixed(2)} s = ${fmt(fastRate)} records/s, ${validatedVerdict(fastRate)}`)
console.log(`  CPU time: ${fastCpu.toFixed(2)} s = ${fmt(fastCpuRate)} records per CPU-second, ${validatedVerdict(fastCpuRate)}`)
console.log(`  goal: ${fmt(VALIDATED_GOAL_PER_SECOND)} records/s on one core; ${fmt(rejected)} generated records rejected`)
console.log(`  validation costs ${(checkRate / fastRate - 1).toFixed(2)}x the check alone on top of it`)
console.log('zod validation + checkRecord (the schema alone, for comparison; no goal):')
console.log(`  wall clock: ${fmt(count)} records in ${zodWall.toFixed(2)} s = ${fmt(zodRate)} records/s; CPU time ${fmt(count / zodCpu)} records per CPU-second`)
console.log(`  validation costs ${(checkRate / zodRate).toFixed(1)}x the check alone`)
console.log('machine:')
console.log(`  ${availableParallelism()} CPUs, load average ${loadavg().map(l => l.toFixed(2)).join(' / ')} (1/5/15 min); on a busy machine trust the CPU-time figures`)
console.log('memory:')
console.log(`  peak RSS ${mb(process.resourceUsage().maxRSS * 1024)} MB; peak heap used ${mb(peakHeap)} MB (one chunk of ${fmt(CHUNK)} records held at a time)`)
