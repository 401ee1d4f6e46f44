// Local stand-in for an S3 service: s3rver speaking the real S3 API, storing objects on disk.
import S3rver from 's3rver'
import { parseArgs } from 'node:util'

const { values } = parseArgs({ options: { port: { type: 'string' }, dir: { type: 'string' }, bucket: { type: 'string' } } })
const server = new S3rver({
  address: '127.0.0.1',
  port: Number(values.port),
  directory: values.dir,
  silent: true,
  configureBuckets: [{ name: values.bucket }],
})
await server.run()
console.log(`s3 fake listening on 127.0.0.1:${values.port}, bucket ${values.bucket}`)
for (const sig of ['SIGINT', 'SIGTERM']) process.on(sig, () => server.close().then(() => process.exit(0)))
