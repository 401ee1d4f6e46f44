import { DataTypes, Model } from 'sequelize'
import type { CreationOptional, ForeignKey, InferAttributes, InferCreationAttributes, Sequelize } from 'sequelize'

// Sequelize models mirror the tables that server/migrations create; migrations own the schema,
// models never call sync(). Model classes stay on the server: the client sees types from shared/.

export class Workspace extends Model<InferAttributes<Workspace>, InferCreationAttributes<Workspace>> {
  declare id: CreationOptional<number>
  declare name: string
  declare contactPhone: string | null
  declare contactEmail: string | null
  declare address: string | null
  declare licenceNumber: string | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export class Client extends Model<InferAttributes<Client>, InferCreationAttributes<Client>> {
  declare id: CreationOptional<number>
  declare workspaceId: ForeignKey<number>
  declare name: string
  declare contactName: string | null
  declare reportEmail: string
  declare phone: string | null
  declare reinspectIntervalMonths: CreationOptional<number>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export class User extends Model<InferAttributes<User>, InferCreationAttributes<User>> {
  declare id: CreationOptional<number>
  declare workspaceId: number
  declare clientId: number | null
  declare email: string
  declare name: string
  declare role: 'admin' | 'officer' | 'installer' | 'manager'
  declare passwordHash: string | null
  declare active: CreationOptional<boolean>
  declare lastSignInAt: Date | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export class Site extends Model<InferAttributes<Site>, InferCreationAttributes<Site>> {
  declare id: CreationOptional<number>
  declare workspaceId: number
  declare clientId: number
  declare ref: string
  declare name: string
  declare address: string
  declare jurisdiction: 'AU' | 'CA' | 'US' | 'EU'
  declare premises: string
  declare notes: string | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export class Unit extends Model<InferAttributes<Unit>, InferCreationAttributes<Unit>> {
  declare id: CreationOptional<number>
  declare siteId: number
  declare ref: string
  declare name: string | null
  declare floor: string | null
  declare notes: string | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export class Opening extends Model<InferAttributes<Opening>, InferCreationAttributes<Opening>> {
  declare id: CreationOptional<number>
  declare siteId: number
  declare unitId: number
  declare ref: string
  declare room: string
  declare kind: CreationOptional<'window' | 'door' | 'other'>
  declare childrensRoom: CreationOptional<boolean>
  declare recessWidthMm: number | null
  declare recessHeightMm: number | null
  declare notes: string | null
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export class Covering extends Model<InferAttributes<Covering>, InferCreationAttributes<Covering>> {
  declare id: CreationOptional<number>
  declare siteId: number
  declare openingId: number
  declare ref: string
  declare productType: string
  declare control: string
  declare madeTo: string | null
  declare mount: 'inside' | 'outside' | null
  declare fixing: 'top' | 'face' | null
  declare controlSide: 'left' | 'right' | 'centre' | null
  declare widthMm: number | null
  declare dropMm: number | null
  declare makerModel: string | null
  declare manufacturedOn: string | null
  declare installedOn: string | null
  declare status: CreationOptional<'in_place' | 'removed'>
  declare lastInspectionId: CreationOptional<number | null>
  declare lastVerdict: CreationOptional<string | null>
  declare lastInspectedAt: CreationOptional<Date | null>
  declare changedSinceInspection: CreationOptional<boolean>
  declare changedFields: CreationOptional<string[]>
  declare changedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export class Inspection extends Model<InferAttributes<Inspection>, InferCreationAttributes<Inspection>> {
  declare id: CreationOptional<number>
  declare workspaceId: number
  declare siteId: number
  declare coveringId: number
  declare kind: 'fitting' | 'audit' | 'import' | 'correction'
  declare inspectedAt: Date
  declare inspectorId: number | null
  declare record: Record<string, unknown>
  declare rulesVersion: string
  declare verdict: string
  declare notes: string | null
  declare correctsId: number | null
  declare clientKey: CreationOptional<string | null>
  declare auditId: CreationOptional<number | null>
  declare importId: CreationOptional<number | null>
  declare sourceRow: CreationOptional<number | null>
  declare bodySha256: CreationOptional<string | null>
  declare confirmsId: CreationOptional<number | null>
  declare createdAt: CreationOptional<Date>
}

export class Finding extends Model<InferAttributes<Finding>, InferCreationAttributes<Finding>> {
  declare id: CreationOptional<number>
  declare inspectionId: number
  declare clause: string
  declare verdict: string
  declare measured: string | null
  declare limitValue: string | null
  declare unit: string | null
  declare field: string | null
  declare source: string
  declare basis: string
  declare message: string
  declare fix: string | null
}

export class Photo extends Model<InferAttributes<Photo>, InferCreationAttributes<Photo>> {
  declare id: CreationOptional<number>
  declare workspaceId: number
  declare siteId: number
  declare coveringId: number
  declare kind: 'whole' | 'tension_device' | 'cleat' | 'labels' | 'defect'
  declare objectKey: string
  declare thumbKey: string | null
  declare contentType: string
  declare sizeBytes: number
  declare sha256: string
  declare capturedAt: Date | null
  declare uploadedBy: number
  declare fileName: string | null
  declare widthPx: number | null
  declare heightPx: number | null
  declare createdAt: CreationOptional<Date>
}

export class ActivityEntry extends Model<InferAttributes<ActivityEntry>, InferCreationAttributes<ActivityEntry>> {
  declare id: CreationOptional<number>
  declare workspaceId: number
  declare userId: number | null
  declare action: string
  declare entity: string
  declare entityId: number | null
  declare detail: CreationOptional<Record<string, unknown>>
  declare at: CreationOptional<Date>
}

// Sequelize writes into attribute definitions, so each column gets a fresh object.
export class Audit extends Model<InferAttributes<Audit>, InferCreationAttributes<Audit>> {
  declare id: CreationOptional<number>
  declare workspaceId: number
  declare siteId: number
  declare status: CreationOptional<'open' | 'closed'>
  declare openedBy: number
  declare openedAt: CreationOptional<Date>
  declare closedBy: CreationOptional<number | null>
  declare closedByName: CreationOptional<string | null>
  declare closedAt: CreationOptional<Date | null>
  declare summary: CreationOptional<Record<string, number> | null>
  declare notes: CreationOptional<string | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export class Fix extends Model<InferAttributes<Fix>, InferCreationAttributes<Fix>> {
  declare id: CreationOptional<number>
  declare workspaceId: number
  declare siteId: number
  declare coveringId: number
  declare clause: string
  declare raisedByInspectionId: number
  declare message: string
  declare fix: string | null
  declare source: string
  declare priority: number
  declare status: CreationOptional<'open' | 'closed'>
  declare assigneeId: CreationOptional<number | null>
  declare dueOn: string
  declare closedByInspectionId: CreationOptional<number | null>
  declare closedByRemovalId: CreationOptional<number | null>
  declare closedAt: CreationOptional<Date | null>
  declare createdAt: CreationOptional<Date>
  declare updatedAt: CreationOptional<Date>
}

export type JobKind = 'import' | 'recheck' | 'export'
export type JobStatus = 'queued' | 'running' | 'succeeded' | 'failed' | 'cancelled'

/** A background job as pages see it; pg-boss only distributes it (queueJobId). */
export class Job extends Model<InferAttributes<Job>, InferCreationAttributes<Job>> {
  declare id: CreationOptional<number>
  declare workspaceId: number
  declare clientId: number | null
  declare siteId: CreationOptional<number | null>
  declare kind: JobKind
  declare status: CreationOptional<JobStatus>
  declare params: CreationOptional<Record<string, unknown>>
  declare progressDone: CreationOptional<number>
  declare progressTotal: CreationOptional<number | null>
  declare counts: CreationOptional<Record<string, unknown>>
  declare error: CreationOptional<string | null>
  declare cancelRequested: CreationOptional<boolean>
  declare attempts: CreationOptional<number>
  declare queueJobId: CreationOptional<string | null>
  declare createdBy: number
  declare createdAt: CreationOptional<Date>
  declare startedAt: CreationOptional<Date | null>
  declare heartbeatAt: CreationOptional<Date | null>
  declare finishedAt: CreationOptional<Date | null>
  declare updatedAt: CreationOptional<Date>
}

/** The file side of an import job: what was uploaded, and how many of its rows were bad. */
export class ImportFile extends Model<InferAttributes<ImportFile>, InferCreationAttributes<ImportFile>> {
  declare jobId: number
  declare mode: 'dry_run' | 'commit'
  declare skipInvalid: boolean
  declare dryRunId: number | null
  declare fileName: string
  declare objectKey: string
  declare sizeBytes: number
  declare sha256: string
  declare rowCount: number
  declare badRowCount: CreationOptional<number>
  declare errorCount: CreationOptional<number>
}

const id = () => ({ type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true })
const ref = () => ({ type: DataTypes.TEXT, allowNull: false })
const text = () => ({ type: DataTypes.TEXT })
const int = () => ({ type: DataTypes.INTEGER })
const stamps = () => ({ createdAt: DataTypes.DATE, updatedAt: DataTypes.DATE })

export function initModels(sequelize: Sequelize) {
  const base = { sequelize, underscored: true }
  Workspace.init({ id: id(), name: ref(), contactPhone: text(), contactEmail: text(), address: text(), licenceNumber: text(), ...stamps() },
    { ...base, tableName: 'workspaces' })
  Client.init({ id: id(), workspaceId: int(), name: ref(), contactName: text(), reportEmail: ref(), phone: text(),
    reinspectIntervalMonths: int(), ...stamps() }, { ...base, tableName: 'clients' })
  User.init({ id: id(), workspaceId: int(), clientId: int(), email: ref(), name: ref(), role: ref(), passwordHash: text(),
    active: DataTypes.BOOLEAN, lastSignInAt: DataTypes.DATE, ...stamps() }, { ...base, tableName: 'users' })
  Site.init({ id: id(), workspaceId: int(), clientId: int(), ref: ref(), name: ref(), address: ref(), jurisdiction: ref(), premises: ref(),
    notes: text(), ...stamps() }, { ...base, tableName: 'sites' })
  Unit.init({ id: id(), siteId: int(), ref: ref(), name: text(), floor: text(), notes: text(), ...stamps() }, { ...base, tableName: 'units' })
  Opening.init({ id: id(), siteId: int(), unitId: int(), ref: ref(), room: ref(), kind: text(), childrensRoom: DataTypes.BOOLEAN,
    recessWidthMm: int(), recessHeightMm: int(), notes: text(), ...stamps() }, { ...base, tableName: 'openings' })
  Covering.init({ id: id(), siteId: int(), openingId: int(), ref: ref(), productType: ref(), control: ref(), madeTo: text(), mount: text(),
    fixing: text(), controlSide: text(), widthMm: int(), dropMm: int(), makerModel: text(), manufacturedOn: text(),
    installedOn: DataTypes.DATEONLY, status: text(), lastInspectionId: int(), lastVerdict: text(),
    lastInspectedAt: DataTypes.DATE, changedSinceInspection: DataTypes.BOOLEAN, changedFields: DataTypes.ARRAY(DataTypes.TEXT), changedAt: DataTypes.DATE,
    ...stamps() }, { ...base, tableName: 'coverings' })
  Inspection.init({ id: id(), workspaceId: int(), siteId: int(), coveringId: int(), kind: ref(), inspectedAt: DataTypes.DATE,
    inspectorId: int(), record: DataTypes.JSONB, rulesVersion: ref(), verdict: ref(), notes: text(), correctsId: int(), clientKey: text(), auditId: int(),
    importId: int(), sourceRow: int(), bodySha256: text(), confirmsId: int(), createdAt: DataTypes.DATE }, { ...base, tableName: 'inspections', updatedAt: false })
  Finding.init({ id: id(), inspectionId: int(), clause: ref(), verdict: ref(), measured: text(), limitValue: text(), unit: text(),
    field: text(), source: ref(), basis: ref(), message: ref(), fix: text() }, { ...base, tableName: 'findings', timestamps: false })
  Photo.init({ id: id(), workspaceId: int(), siteId: int(), coveringId: int(), kind: ref(), objectKey: ref(), thumbKey: text(),
    contentType: ref(), sizeBytes: int(), sha256: ref(), capturedAt: DataTypes.DATE, uploadedBy: int(), fileName: text(), widthPx: int(), heightPx: int(),
    createdAt: DataTypes.DATE }, { ...base, tableName: 'photos', updatedAt: false })
  ActivityEntry.init({ id: { ...id(), type: DataTypes.BIGINT }, workspaceId: int(), userId: int(), action: ref(), entity: ref(),
    entityId: int(), detail: DataTypes.JSONB, at: DataTypes.DATE }, { ...base, tableName: 'activity_log', timestamps: false })

  Audit.init({ id: id(), workspaceId: int(), siteId: int(), status: text(), openedBy: int(), openedAt: DataTypes.DATE,
    closedBy: int(), closedByName: text(), closedAt: DataTypes.DATE, summary: DataTypes.JSONB, notes: text(), ...stamps() },
  { ...base, tableName: 'audits' })
  Fix.init({ id: id(), workspaceId: int(), siteId: int(), coveringId: int(), clause: ref(), raisedByInspectionId: int(), message: ref(),
    fix: text(), source: ref(), priority: int(), status: text(), assigneeId: int(), dueOn: DataTypes.DATEONLY,
    closedByInspectionId: int(), closedByRemovalId: int(), closedAt: DataTypes.DATE, ...stamps() }, { ...base, tableName: 'fixes' })

  Job.init({ id: id(), workspaceId: int(), clientId: int(), siteId: int(), kind: ref(), status: text(), params: DataTypes.JSONB,
    progressDone: int(), progressTotal: int(), counts: DataTypes.JSONB, error: text(), cancelRequested: DataTypes.BOOLEAN, attempts: int(),
    queueJobId: text(), createdBy: int(), startedAt: DataTypes.DATE, heartbeatAt: DataTypes.DATE, finishedAt: DataTypes.DATE, ...stamps() },
  { ...base, tableName: 'jobs' })
  ImportFile.init({ jobId: { type: DataTypes.INTEGER, primaryKey: true }, mode: ref(), skipInvalid: DataTypes.BOOLEAN, dryRunId: int(),
    fileName: ref(), objectKey: ref(), sizeBytes: int(), sha256: ref(), rowCount: int(), badRowCount: int(), errorCount: int() },
  { ...base, tableName: 'imports', timestamps: false })

  Client.hasMany(Site, { foreignKey: 'clientId' })
  Site.belongsTo(Client, { foreignKey: 'clientId' })
  Site.hasMany(Unit, { foreignKey: 'siteId' })
  Unit.belongsTo(Site, { foreignKey: 'siteId' })
  Unit.hasMany(Opening, { foreignKey: 'unitId' })
  Opening.belongsTo(Unit, { foreignKey: 'unitId' })
  Opening.hasMany(Covering, { foreignKey: 'openingId' })
  Covering.belongsTo(Opening, { foreignKey: 'openingId' })
  Covering.hasMany(Inspection, { foreignKey: 'coveringId' })
  Inspection.hasMany(Finding, { foreignKey: 'inspectionId' })
  Inspection.belongsTo(User, { foreignKey: 'inspectorId', as: 'inspector' })
}
