// Public face of the rulebook and check engine: the app imports only from here.
export {
  coveringRecordSchema,
  controlTypes,
  corded,
  deviceFixings,
  innerCorded,
  jurisdictions,
  looped,
  madeToValues,
  premisesTypes,
  productTypes,
} from './record'
export { fieldKinds, formatRecordError, parseCoveringRecord, validateRecords } from './validate'
export type { RecordError, RecordParseResult, ValidationResult } from './validate'
export type {
  ControlType,
  CoveringRecord,
  CoveringRecordInput,
  DeviceFixing,
  Jurisdiction,
  MadeTo,
  PremisesType,
  ProductType,
  RecordField,
} from './record'
export type {
  AppliesTo,
  Basis,
  CheckOptions,
  CheckResult,
  Clause,
  ClauseContext,
  ClauseKind,
  ClauseVerdict,
  DateField,
  DateWindow,
  Evaluator,
  Finding,
  MeasuredValue,
  OverallVerdict,
  RuleSet,
  RuleSetMap,
  Source,
  Threshold,
  Unit,
} from './types'
export { checkRecord, checkRecords, currentDateIso, getRuleSet } from './engine'
export { ruleSets } from './sets'
export { describeClause, describeRuleSet, describeRuleSets } from './describe'
export type { ClauseDescription, RuleSetDescription } from './describe'
export { advise, fail, missing, notApplicable, pass, requireFlag } from './findings'
export {
  HEIGHTS_AND_DROPS,
  inchesToMm,
  installerGuide,
  lowestCleatHeightMm,
  maxDropWithSafetyDeviceMm,
  maxUnguardedDropMm,
  mmToInches,
  perimeterFromPullOutMm,
  pullOutFromPerimeterMm,
  tensionDeviceFixingRange,
  tensionDevicePosition,
  usCustomOperatingCordDefaultMm,
} from './arithmetic'
export type { DeviceDrops, DevicePosition, DropInput, FixingRange, GuideFigure, InstallerGuide, InstallerGuideInput } from './arithmetic'
export { buildRecord, registerFactsOf, registerFields } from './build'
export type { RegisterFacts } from './build'
export { inchesToTenthMm, readForce, readLength } from './lengths'
export type { LengthUnit, Reading } from './lengths'
