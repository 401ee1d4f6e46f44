// Makes the first admin outside demo mode:
//   npm run user:create -- --email you@example.com --name "Your Name" --workspace "Business name" [--password ...]
// Without --password one is generated and printed once.
import { randomBytes } from 'node:crypto'
import { parseArgs } from 'node:util'
import { createSequelize } from '../server/db'
import { User, Workspace } from '../server/models'
import { hashPasswordOffline } from '../server/lib/password'
import { passwordSchema } from '../shared/schemas/auth'

const { values } = parseArgs({ options: {
  email: { type: 'string' }, name: { type: 'string' }, workspace: { type: 'string' }, password: { type: 'string' },
} })
if (!values.email || !values.name || !values.workspace) {
  console.error('usage: npm run user:create -- --email EMAIL --name NAME --workspace "BUSINESS NAME" [--password PASSWORD]')
  process.exit(2)
}
const password = values.password ?? randomBytes(12).toString('base64url')
const checked = passwordSchema.safeParse(password)
if (!checked.success) {
  console.error(`password: ${checked.error.issues[0]?.message}`)
  process.exit(2)
}
const sequelize = createSequelize(undefined, { poolMax: 2 })
try {
  if (await User.findOne({ where: sequelize.where(sequelize.fn('lower', sequelize.col('email')), values.email.toLowerCase()) })) {
    console.error(`email: a user with ${values.email} already exists`)
    process.exit(2)
  }
  const workspace = await Workspace.findOne({ where: { name: values.workspace } }) ?? await Workspace.create({
    name: values.workspace, contactPhone: null, contactEmail: values.email, address: null, licenceNumber: null,
  })
  const user = await User.create({
    workspaceId: workspace.id, clientId: null, email: values.email, name: values.name, role: 'admin',
    passwordHash: await hashPasswordOffline(password), lastSignInAt: null,
  })
  console.log(`admin #${user.id} ${user.email} created in workspace "${workspace.name}"`)
  if (!values.password) console.log(`password (shown once): ${password}`)
}
finally {
  await sequelize.close()
}
