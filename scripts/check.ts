// Check covering records from the command line:
//   npm run --silent check -- FILE.json [--today YYYY-MM-DD]
//   npm run --silent check -- - < FILE.json
// Prints the array of results as JSON and exits 0; exits 2 with the record and field named on bad input.
import { readFileSync } from 'node:fs'
import { checkRecords, formatRecordError, validateRecords } from '../rules/index'

const USAGE = 'usage: check FILE.json | - [--today YYYY-MM-DD]'

function stop(message: string): never {
  process.stderr.write(`${message}\n`)
  process.exit(2)
}

function parseArgs(argv: string[]): { file: string, today: string | undefined } {
  let file: string | undefined
  let today: string | undefined
  for (let i = 0; i < argv.length; i++) {
    const arg = argv[i]!
    if (arg === '--today') {
      today = argv[++i]
      if (today === undefined || !/^\d{4}-\d{2}-\d{2}$/.test(today)) stop(`--today needs a date written YYYY-MM-DD\n${USAGE}`)
    }
    else if (arg === '--help' || arg === '-h') {
      process.stdout.write(`${USAGE}\n`)
      process.exit(0)
    }
    else if (file === undefined) {
      file = arg
    }
    else {
      stop(`unexpected argument ${JSON.stringify(arg)}\n${USAGE}`)
    }
  }
  if (file === undefined) stop(USAGE)
  return { file, today }
}

function readInput(file: string): string {
  try {
    return readFileSync(file === '-' ? 0 : file, 'utf8')
  }
  catch (e) {
    return stop(`cannot read ${file === '-' ? 'standard input' : file}: ${(e as Error).message}`)
  }
}

const { file, today } = parseArgs(process.argv.slice(2))
const text = readInput(file)
let input: unknown
try {
  input = JSON.parse(text)
}
catch (e) {
  stop(`${file === '-' ? 'standard input' : file} is not valid JSON: ${(e as Error).message}`)
}
const validated = validateRecords(input)
if (!validated.ok) {
  stop(validated.errors.map(formatRecordError).join('\n'))
}
const results = checkRecords(validated.records, today === undefined ? undefined : { today })
process.stdout.write(`${JSON.stringify(results, null, 2)}\n`)
