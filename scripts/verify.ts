// npm run verify [-- --workspace N]: recomputes the tamper-evidence chain of every evidence table (inspections,
// findings, photos, check results, removals, activity) and names the first row, per table, that no longer
// matches what was recorded when it was written. Exits 0 when every chain verifies, 1 when one does not,
// 2 on bad arguments or when the database cannot be read. Reads only.
import { parseArgs } from 'node:util'
import { createSequelize } from '../server/db'
import { chainFingerprint, describeBreak, verifyEvidence } from '../server/services/evidence-chain'

let args: { workspace?: string }
try {
  args = parseArgs({ options: { workspace: { type: 'string' } } }).values
}
catch (err) {
  console.error(`${(err as Error).message}\nusage: npm run verify [-- --workspace N]`)
  process.exit(2)
}
const workspaceId = args.workspace === undefined ? undefined : Number(args.workspace)
if (workspaceId !== undefined && !(Number.isInteger(workspaceId) && workspaceId > 0)) {
  console.error('--workspace needs a workspace id (a whole number above 0)\nusage: npm run verify [-- --workspace N]')
  process.exit(2)
}
if (!process.env.DATABASE_URL) {
  console.error('DATABASE_URL is not set: run `npm run verify` (it uses the `npm start` database) or point DATABASE_URL at PostgreSQL')
  process.exit(2)
}

const db = createSequelize(undefined, { poolMax: 1 })
let code = 2
try {
  const started = Date.now()
  const report = await verifyEvidence(db, { workspaceId })
  const width = Math.max(...report.tables.map(t => t.table.length))
  for (const t of report.tables) {
    const b = report.breaks.find(x => x.table === t.table)
    const state = b ? `BROKEN (${t.problems.toLocaleString('en-GB')} ${t.problems === 1 ? 'problem' : 'problems'}); first: ${describeBreak(b)}` : 'intact'
    console.log(`${t.table.padEnd(width)}  ${t.rows.toLocaleString('en-GB').padStart(10)} rows  ${t.blocks.toLocaleString('en-GB').padStart(8)} blocks  ${state}`)
  }
  const scope = workspaceId === undefined ? 'every workspace' : `workspace ${workspaceId}`
  if (report.firstBreak) {
    console.log(`[tautline] evidence chain BROKEN (${scope}): first at ${describeBreak(report.firstBreak)}`)
    code = 1
  }
  else {
    console.log(`[tautline] evidence chain intact (${scope}): ${report.rows.toLocaleString('en-GB')} rows verified in ${((Date.now() - started) / 1000).toFixed(1)} s`)
    code = 0
  }
  if (workspaceId === undefined) console.log(`[tautline] chain fingerprint ${await chainFingerprint(db)} (note it elsewhere to prove later that history was not rewritten)`)
}
catch (err) {
  console.error(`[tautline] could not verify the evidence chain: ${(err as Error).message}`)
  code = 2
}
finally {
  await db.close()
}
process.exit(code)
