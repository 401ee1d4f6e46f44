// Plain-word labels for the codes the API sends, so every screen words things the same way.
import type { Verdict } from '#shared/types/register'

export type Role = 'admin' | 'officer' | 'installer' | 'manager'
/** A covering's verdict, with `unchecked` for a covering never inspected. */
export type VerdictKey = Verdict | 'unchecked'
export type FindingVerdict = 'pass' | 'fail' | 'missing' | 'not_applicable' | 'advice'

export const roleLabels: Record<Role, string> = {
  admin: 'Administrator',
  officer: 'Compliance officer',
  installer: 'Installer',
  manager: 'Property manager',
}

/** What each role does, in one line, for the invitation form. */
export const roleDescriptions: Record<Role, string> = {
  installer: 'Records coverings and their cord details at fitting.',
  officer: 'Audits sites, manages clients and sites, follows up failures.',
  manager: 'Sees one client\'s properties, read-only.',
  admin: 'Everything an officer does, plus users and the mailbox.',
}

export const verdictLabels: Record<VerdictKey, string> = {
  compliant: 'Compliant',
  non_compliant: 'Non-compliant',
  incomplete: 'Incomplete',
  not_applicable: 'Not applicable',
  unchecked: 'Not yet checked',
}

export const findingLabels: Record<FindingVerdict, string> = {
  fail: 'Fails',
  missing: 'Detail missing',
  advice: 'Advice',
  pass: 'Meets',
  not_applicable: 'Not applicable',
}

export const jurisdictionLabels: Record<string, string> = {
  AU: 'Australia',
  CA: 'Canada',
  US: 'United States',
  EU: 'European Union',
}

export const premisesLabels: Record<string, string> = {
  home: 'Home',
  rental_home: 'Rental home',
  childcare: 'Childcare centre',
  school: 'School',
  hotel: 'Hotel',
  healthcare: 'Healthcare',
  shop: 'Shop',
  office: 'Office',
  industrial: 'Industrial',
}

export const productLabels: Record<string, string> = {
  roller: 'Roller blind',
  roman: 'Roman blind',
  venetian: 'Venetian (slatted)',
  vertical: 'Vertical blind',
  cellular: 'Cellular blind',
  pleated: 'Pleated blind',
  panel: 'Panel glide',
  curtain: 'Curtain',
  other: 'Other',
}

export const controlLabels: Record<string, string> = {
  chain_loop: 'Bead-chain loop',
  cord_loop: 'Cord loop',
  free_cord: 'Free-hanging cord',
  wand: 'Wand',
  motorised: 'Motorised',
  cordless: 'Cordless',
}

export const inspectionKindLabels: Record<string, string> = {
  fitting: 'Fitting',
  audit: 'Audit',
  import: 'Imported',
  correction: 'Correction',
}

export const basisLabels: Record<string, string> = {
  published: 'Published text',
  secondary: 'Secondary source',
  common_practice: 'Trade practice',
  memory: 'Unverified figure',
}

/** What each basis means, in a line, for the rulebook page. */
export const basisNotes: Record<string, string> = {
  published: 'Read in the published text of the document.',
  secondary: 'Taken from a secondary source (a summary or guide); the original text was not read.',
  common_practice: 'Common trade practice; no published source.',
  memory: 'Recalled from memory and not checked against a source: confirm before relying on it.',
}

export const clauseKindLabels: Record<string, string> = {
  requirement: 'Requirement',
  advice: 'Advice',
  history: 'Withdrawn',
}

export const photoKindLabels: Record<string, string> = {
  whole: 'Whole covering',
  tension_device: 'Tension device',
  cleat: 'Cleat',
  labels: 'Labels',
  defect: 'Defect',
}

export const deviceFixingLabels: Record<string, string> = {
  timber: 'Screws into timber',
  masonry_plugs: 'Masonry with plugs',
  plasterboard_anchor: 'Plasterboard anchor',
  metal_frame: 'Metal frame',
  adhesive: 'Adhesive',
}

export const openingKindLabels: Record<string, string> = {
  window: 'Window',
  door: 'Door',
  other: 'Other opening',
}

/** Looks a code up in a label map, falling back to the code with underscores as spaces. */
export function labelOf(map: Record<string, string>, code: string | null | undefined, empty = '—'): string {
  if (!code) return empty
  return map[code] ?? code.replaceAll('_', ' ')
}

// Record fields in the trade's words; anything not listed is spelled out from its name.
const fieldNames: Record<string, string> = {
  headHeightMm: 'Head rail height',
  productHeightMm: 'Product height',
  lowestCordPointMm: 'Lowest cord point above floor',
  loopPullOutMm: 'Largest loop pulled out',
  loopPerimeterMm: 'Loop perimeter',
  freeCordLengthMm: 'Longest free cord',
  operatingCordLengthMm: 'Operating cord length',
  rearCordSpacingMm: 'Rear cord spacing',
  cordSpanMm: 'Cord span between contact points',
  jointFreeCordsMm: 'Two free cords joined',
  innerCordStops: 'Inner cord stops fitted',
  innerCordsReachable: 'Inner cords reachable',
  tensionDevice: 'Tension device fitted',
  tensionDeviceHeightMm: 'Tension device height',
  tensionDeviceHoldN: 'Tension device hold',
  tensionDeviceTamperProof: 'Tension device tamper-proof',
  cleat: 'Cleat fitted',
  cleatHeightMm: 'Cleat height',
  breakaway: 'Breakaway connector',
  warningLabel: 'Warning label attached',
  swingTag: 'Swing tag attached',
  installerLabel: 'Installer\'s label attached',
  manufacturerLabel: 'Maker\'s label attached',
  climbableFurnitureNearby: 'Climbable furniture nearby',
  childrensRoom: 'Children\'s room',
  longerCordRequested: 'Longer cord requested',
  deviceFixing: 'Device fixed into',
  installedOn: 'Installed on',
  manufacturedOn: 'Manufactured',
  madeTo: 'Made to',
  productType: 'Product',
  control: 'Control',
  premises: 'Premises',
  jurisdiction: 'Region',
}

export function fieldLabel(name: string | null): string {
  if (!name) return ''
  if (fieldNames[name]) return fieldNames[name]
  const words = name.replace(/(Mm|N)$/, '').replace(/([A-Z])/g, ' $1').toLowerCase().trim()
  return words.charAt(0).toUpperCase() + words.slice(1)
}

/** The unit a record field is measured in, read from its name (…Mm, …N). */
export function fieldUnit(name: string): string | null {
  if (name.endsWith('Mm')) return 'mm'
  if (name.endsWith('HoldN')) return 'N'
  return null
}

export const entityLabels: Record<string, string> = {
  user: 'User',
  client: 'Client',
  site: 'Site',
  unit: 'Unit',
  opening: 'Opening',
  covering: 'Covering',
  fix: 'Remedy',
  report_dispatch: 'Report',
}

const actionWords: Record<string, string> = {
  'user.sign_in': 'Signed in',
  'user.invited': 'Invited a user',
  'user.invite_accepted': 'Accepted an invitation',
  'user.password_reset': 'Reset a password',
  'user.updated': 'Changed a user',
  'photo.added': 'Added a photo',
  'inspection.fitting': 'Recorded a fitting',
  'inspection.audit': 'Recorded an audit',
  'inspection.import': 'Imported an inspection',
  'inspection.correction': 'Recorded a correction',
  'audit.opened': 'Started a site audit',
  'audit.closed': 'Closed a site audit',
  'audit.not_accessible': 'Marked a covering not accessible',
  'fix.raised': 'A remedy was raised',
  'fix.closed': 'A remedy was closed',
  'fix.updated': 'Changed a remedy',
  'report.sent': 'E-mailed a report',
  'report.queued': 'A report e-mail was queued for retry',
  'report.failed': 'A report e-mail failed',
}

/** An activity code such as `site.created` in words: "Created a site". */
export function actionLabel(action: string): string {
  if (actionWords[action]) return actionWords[action]
  const [entity = '', verb = ''] = action.split('.')
  const noun = (entityLabels[entity] ?? entity).toLowerCase()
  const article = /^[aeiou]/.test(noun) ? 'an' : 'a'
  if (verb === 'created') return `Added ${article} ${noun}`
  if (verb === 'updated') return `Changed ${article} ${noun}`
  return action.replaceAll('_', ' ').replace('.', ': ')
}

/** A remedy's priority in words; days mirror daysToRemedy in server/services/fixes.ts. */
export const priorityLabels: Record<number, { name: string, meaning: string, days: number }> = {
  1: { name: 'Urgent', meaning: 'A cord or loop that fails its rule where young children sleep or play (a children\'s room, childcare or school).', days: 2 },
  2: { name: 'High', meaning: 'A cord or loop that fails its rule anywhere else.', days: 7 },
  3: { name: 'Labelling', meaning: 'A warning, maker\'s or installer\'s label or swing tag is missing.', days: 14 },
  4: { name: 'Routine', meaning: 'Anything else the rules ask for.', days: 28 },
}

export const auditItemLabels: Record<string, string> = {
  pending: 'To do',
  measured: 'Re-measured',
  confirmed: 'Confirmed unchanged',
  not_accessible: 'Not accessible',
}

export const dispatchStatusLabels: Record<string, string> = {
  sent: 'Sent',
  queued: 'Queued for retry',
  failed: 'Not delivered',
}
