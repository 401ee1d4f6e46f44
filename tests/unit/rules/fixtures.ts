import { checkRecord, coveringRecordSchema } from '../../../rules'
import type { CheckOptions, CheckResult, CoveringRecord, CoveringRecordInput, Finding } from '../../../rules'

// Records that pass every requirement of their rule set; tests change one field at a time.

export const TODAY = '2026-12-01'

export const auBase: CoveringRecordInput = {
  ref: 'AU-1',
  jurisdiction: 'AU',
  premises: 'home',
  installedOn: '2024-03-01',
  manufacturedOn: '2023-11',
  madeTo: 'custom',
  productType: 'roller',
  control: 'chain_loop',
  headHeightMm: 2100,
  productHeightMm: 1800,
  lowestCordPointMm: 1000,
  loopPullOutMm: 100,
  tensionDevice: true,
  tensionDeviceHeightMm: 1000,
  tensionDeviceHoldN: 75,
  tensionDeviceTamperProof: true,
  cleat: false,
  breakaway: false,
  warningLabel: true,
  swingTag: true,
  installerLabel: true,
  manufacturerLabel: true,
  climbableFurnitureNearby: false,
  childrensRoom: false,
  installedPerInstructions: true,
}

export const caBase: CoveringRecordInput = {
  ref: 'CA-1',
  jurisdiction: 'CA',
  premises: 'home',
  installedOn: '2023-06-01',
  manufacturedOn: '2023-05',
  madeTo: 'stock',
  productType: 'roller',
  control: 'chain_loop',
  headHeightMm: 2100,
  lowestCordPointMm: 1700,
  loopPerimeterMm: 400,
  loopPullOutMm: 200,
  cordSpanMm: 200,
  tensionDevice: false,
  breakaway: false,
  warningLabel: true,
  manufacturerLabel: true,
  bilingualInformation: true,
  climbableFurnitureNearby: false,
}

export const usStockBase: CoveringRecordInput = {
  ref: 'US-1',
  jurisdiction: 'US',
  premises: 'home',
  installedOn: '2023-08-01',
  manufacturedOn: '2023-06',
  madeTo: 'stock',
  productType: 'roller',
  control: 'free_cord',
  headHeightMm: 2100,
  productHeightMm: 1500,
  operatingCordLengthMm: 150,
  freeCordLengthMm: 150,
  manufacturerLabel: true,
  warningLabel: true,
  swingTag: true,
  climbableFurnitureNearby: false,
}

export const usCustomLoopBase: CoveringRecordInput = {
  ref: 'US-2',
  jurisdiction: 'US',
  premises: 'home',
  installedOn: '2025-02-01',
  manufacturedOn: '2025-01-15',
  madeTo: 'custom',
  productType: 'roller',
  control: 'chain_loop',
  headHeightMm: 2400,
  productHeightMm: 2000,
  lowestCordPointMm: 900,
  loopPullOutMm: 20,
  tensionDevice: true,
  tensionDeviceFactoryFitted: true,
  operatesWithoutTensionDevice: false,
  manufacturerLabel: true,
  warningLabel: true,
  swingTag: true,
}

export const euBase: CoveringRecordInput = {
  ref: 'EU-1',
  jurisdiction: 'EU',
  premises: 'home',
  installedOn: '2024-03-01',
  manufacturedOn: '2024-01',
  madeTo: 'custom',
  productType: 'roller',
  control: 'chain_loop',
  headHeightMm: 2300,
  lowestCordPointMm: 1600,
  loopPullOutMm: 350,
  tensionDevice: false,
  breakaway: false,
  warningLabel: true,
  manufacturerLabel: true,
  installerLabel: true,
  climbableFurnitureNearby: false,
}

/** Parse a base record with some fields changed, as the app would. */
export function rec(base: CoveringRecordInput, changes: Partial<CoveringRecordInput> = {}): CoveringRecord {
  return coveringRecordSchema.parse({ ...base, ...changes })
}

export function check(base: CoveringRecordInput, changes: Partial<CoveringRecordInput> = {}, options: CheckOptions = {}): CheckResult {
  return checkRecord(rec(base, changes), { today: TODAY, ...options })
}

export function findingOf(result: CheckResult, clause: string): Finding {
  const f = result.findings.find(x => x.clause === clause)
  if (f === undefined) throw new Error(`no finding for ${clause} in ${result.jurisdiction}`)
  return f
}

/** The one clause's finding after changing the base record. */
export function clause(id: string, base: CoveringRecordInput, changes: Partial<CoveringRecordInput> = {}, options: CheckOptions = {}): Finding {
  return findingOf(check(base, changes, options), id)
}
