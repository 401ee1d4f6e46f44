// Local stand-in for an SMTP relay: accepts every message and stores it as an .eml file.
import { SMTPServer } from 'smtp-server'
import { createWriteStream } from 'node:fs'
import { join } from 'node:path'
import { parseArgs } from 'node:util'

const { values } = parseArgs({ options: { port: { type: 'string' }, dir: { type: 'string' } } })
let seq = 0
const server = new SMTPServer({
  authOptional: true,
  disabledCommands: ['STARTTLS'],
  size: 30 * 1024 * 1024,
  onData(stream, session, callback) {
    const name = `${new Date().toISOString().replace(/[:.]/g, '-')}-${process.pid}-${++seq}.eml`
    const file = createWriteStream(join(values.dir, `${name}.part`))
    stream.pipe(file)
    file.on('finish', async () => {
      const { rename } = await import('node:fs/promises')
      await rename(join(values.dir, `${name}.part`), join(values.dir, name))
      callback()
    })
    file.on('error', callback)
  },
})
server.listen(Number(values.port), '127.0.0.1', () => console.log(`smtp fake listening on 127.0.0.1:${values.port}`))
for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => server.close(() => process.exit(0)))
