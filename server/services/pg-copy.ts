import pg from 'pg'
import type { Transaction } from 'sequelize'

// Bulk rows go to PostgreSQL with COPY FROM STDIN, the fastest way in. pg has no COPY of its own (that takes
// another package), so this query answers the server's CopyInResponse by writing each row's cells straight
// into 64 KB chunks as the rows are made: no batch of lines, and no line, is ever held as one string.
const CHUNK = 1 << 16
const TAB = 0x09
const NEWLINE = 0x0a

/** Cells already in COPY's text format (tab-separated, escaped), written as they are. */
export class CopyText {
  constructor(readonly text: string) {}
}

/** A row to COPY: its cells, in column order. */
export type CopyRow = readonly unknown[]

class CopyFrom extends (pg.Query as unknown as new (text: string) => NodeJS.EventEmitter) {
  // Not `rows`: pg.Query uses that name for a row limit.
  constructor(text: string, private source: Iterable<CopyRow>) { super(text) }
  handleCopyInResponse(connection: { sendCopyFromChunk(chunk: Buffer): void, endCopyFrom(): void, sendCopyFail(message: string): void }) {
    const chunk = Buffer.allocUnsafe(CHUNK)
    let used = 0
    // pg copies each chunk into its own message, so the buffer can be filled again at once.
    const flush = () => {
      if (used) connection.sendCopyFromChunk(chunk.subarray(0, used))
      used = 0
    }
    const byte = (b: number) => {
      if (used === CHUNK) flush()
      chunk[used++] = b
    }
    const text = (s: string) => {
      const length = Buffer.byteLength(s)
      if (used + length > CHUNK) flush()
      if (length > CHUNK) connection.sendCopyFromChunk(Buffer.from(s))
      else used += chunk.write(s, used)
    }
    try {
      for (const row of this.source) {
        for (let i = 0; i < row.length; i++) {
          if (i) byte(TAB)
          text(copyCell(row[i]))
        }
        byte(NEWLINE)
      }
      flush()
      connection.endCopyFrom()
    }
    catch (err) {
      connection.sendCopyFail((err as Error).message)
    }
  }
}

/** A value in COPY's text format: \N for null, and backslash, tab and line breaks escaped. */
export function copyCell(v: unknown): string {
  if (v === null || v === undefined) return '\\N'
  if (typeof v === 'number' || typeof v === 'boolean') return String(v)
  if (v instanceof CopyText) return v.text
  const s = v instanceof Date ? v.toISOString() : typeof v === 'object' ? JSON.stringify(v) : String(v)
  return /[\\\t\n\r]/.test(s) ? s.replace(/\\/g, '\\\\').replace(/\t/g, '\\t').replace(/\n/g, '\\n').replace(/\r/g, '\\r') : s
}

/** Several cells laid out once, to be written many times (see CopyText). */
export function copyText(cells: readonly unknown[]) {
  return new CopyText(cells.map(copyCell).join('\t'))
}

/** COPY rows (made as they are sent) into the table on a raw pg client. */
export function copyInto(client: pg.Client, table: string, columns: readonly string[], rows: Iterable<CopyRow>) {
  return new Promise<void>((resolve, reject) => {
    const q = new CopyFrom(`COPY ${table} (${columns.join(', ')}) FROM STDIN`, rows)
    q.once('end', () => resolve())
    q.once('error', reject)
    client.query(q as unknown as pg.QueryConfig)
  })
}

/** The same, inside a Sequelize transaction (on its connection). */
export function copyIntoTransaction(transaction: Transaction, table: string, columns: readonly string[], rows: Iterable<CopyRow>) {
  return copyInto((transaction as unknown as { connection: pg.Client }).connection, table, columns, rows)
}

/** Adds one row's values to column arrays, for the smaller writes that go through unnest($1::int[], …). */
export function pushColumns(columns: unknown[][], values: readonly unknown[]) {
  for (let i = 0; i < values.length; i++) columns[i]!.push(values[i])
}
