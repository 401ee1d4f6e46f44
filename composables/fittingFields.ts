import { corded, innerCorded, looped } from '../rules'
import type { ControlType, Jurisdiction, ProductType, RecordField } from '../rules'

// The cord details the fitting form asks for, in groups, each with the situations it applies to.
// Lengths are typed in mm or inches, forces in newtons; flags are yes / no / not recorded.

export type FittingFieldKind = 'length' | 'force' | 'flag' | 'fixing'

export interface FittingField {
  name: RecordField
  kind: FittingFieldKind
  label: string
  hint?: string
  /** Only these jurisdictions' rules read the field; elsewhere it folds under "Other details". */
  jurisdictions?: readonly Jurisdiction[]
  /** Shown only when this is true for the covering and what is already recorded. */
  when?: (s: FittingSituation) => boolean
}

export interface FittingGroup { id: string, title: string, fields: FittingField[], when: (s: FittingSituation) => boolean }

export interface FittingSituation {
  control: ControlType
  productType: ProductType
  jurisdiction: Jurisdiction
  /** The site's kind of premises, when known (some clauses read only in offices and industry). */
  premises?: string
  values: Record<string, unknown>
}

const isCorded = (s: FittingSituation) => corded.includes(s.control)
const isLooped = (s: FittingSituation) => looped.includes(s.control)
const isFree = (s: FittingSituation) => s.control === 'free_cord'
const hasInner = (s: FittingSituation) => innerCorded.includes(s.productType)
const withDevice = (s: FittingSituation) => s.values.tensionDevice === true
const withCleat = (s: FittingSituation) => s.values.cleat === true
const innerReachable = (s: FittingSituation) => s.values.innerCordsReachable !== false
const slatTilted = (s: FittingSituation) => s.productType === 'venetian' || s.productType === 'vertical'
const childFreePremises = (s: FittingSituation) => s.premises === 'office' || s.premises === 'industrial'

export const fittingGroups: FittingGroup[] = [
  {
    id: 'heights', title: 'Heights above the floor', when: () => true, fields: [
      { name: 'headHeightMm', kind: 'length', label: 'Top of the head rail', hint: 'From the floor to the top of the head rail.' },
      { name: 'lowestCordPointMm', kind: 'length', label: 'Lowest point of any cord or chain', hint: 'From the floor, with any device as fitted.', when: s => isCorded(s) || hasInner(s) },
      { name: 'productHeightMm', kind: 'length', label: 'Height of the covering', hint: 'Head rail to bottom rail, fully lowered.', jurisdictions: ['US'], when: s => isCorded(s) || hasInner(s) },
      { name: 'operatingCordLengthMm', kind: 'length', label: 'Operating cord or chain hanging', hint: 'Length that hangs below the head rail.', jurisdictions: ['CA', 'US', 'EU'], when: isCorded },
    ],
  },
  {
    id: 'loop', title: 'The loop', when: s => isCorded(s) || hasInner(s), fields: [
      { name: 'loopPullOutMm', kind: 'length', label: 'Largest loop pulled out', hint: 'With any device as fitted, pull out the largest loop the cords can form, lay it flat and measure its length.' },
      { name: 'loopPerimeterMm', kind: 'length', label: 'Loop perimeter', hint: 'All the way round the loop: twice the pulled-out length.' },
      { name: 'cordSpanMm', kind: 'length', label: 'Longest span between contact points', hint: 'Pulled with 35 N between two points the cord touches.', jurisdictions: ['CA'] },
      { name: 'operatingCordsInaccessible', kind: 'flag', label: 'Cord or loop out of reach', hint: 'A rigid shroud or built-in restraint keeps the operating cord from being reached.', jurisdictions: ['US'], when: isCorded },
    ],
  },
  {
    id: 'device', title: 'Tension device', when: isLooped, fields: [
      { name: 'tensionDevice', kind: 'flag', label: 'Tension device fitted', hint: 'Screwed to the wall or frame and holding the loop taut.' },
      { name: 'tensionDeviceHeightMm', kind: 'length', label: 'Tension device height', hint: 'From the floor to the device.', when: withDevice },
      { name: 'deviceFixing', kind: 'fixing', label: 'Fixed into', when: withDevice },
      { name: 'tensionDeviceHoldN', kind: 'force', label: 'Pull test: force held for 10 s', hint: 'Pull the fixed device in each direction; 70 N is about 7 kg.', when: withDevice },
      { name: 'tensionDeviceTamperProof', kind: 'flag', label: 'Cord locked in', hint: 'A child cannot lift the cord out of the device.', jurisdictions: ['AU', 'EU'], when: withDevice },
      { name: 'tensionDeviceHoldsTaut', kind: 'flag', label: 'Holds the loop taut', hint: 'Pulled away from the device, no loop comes out beyond the ~10 mm ease.', jurisdictions: ['EU'], when: withDevice },
      { name: 'tensionDeviceFactoryFitted', kind: 'flag', label: 'Came attached from the maker', hint: 'The device was permanently attached to the cord or chain as supplied.', jurisdictions: ['US'], when: withDevice },
      { name: 'operatesWithoutTensionDevice', kind: 'flag', label: 'Still works with the device loose', hint: 'Yes if the covering can still be raised or lowered with the device not under tension (a fault).', jurisdictions: ['US'], when: withDevice },
    ],
  },
  {
    id: 'free', title: 'Free cord and cleat', when: isFree, fields: [
      { name: 'freeCordLengthMm', kind: 'length', label: 'Longest free cord within reach', hint: 'The longest cord end a child could reach, hanging free.' },
      { name: 'jointFreeCordsMm', kind: 'length', label: 'Two free cords joined', hint: 'How far two cord ends reach when held together; 0 if there is only one.', jurisdictions: ['CA'] },
      { name: 'cleat', kind: 'flag', label: 'Cleat fitted' },
      { name: 'cleatHeightMm', kind: 'length', label: 'Cleat height', hint: 'From the floor to the cleat.', when: withCleat },
      { name: 'deviceFixing', kind: 'fixing', label: 'Cleat fixed into', when: withCleat },
      { name: 'longerCordRequested', kind: 'flag', label: 'Buyer asked for a longer cord', jurisdictions: ['US'] },
      { name: 'multiCordConnector', kind: 'flag', label: 'Cords end in one connector or tassel', hint: 'Two or more operating cords joined at their ends.', jurisdictions: ['US'] },
    ],
  },
  {
    id: 'breakaway', title: 'Breakaway', when: isCorded, fields: [
      { name: 'breakaway', kind: 'flag', label: 'Breakaway connector fitted', jurisdictions: ['EU'] },
    ],
  },
  {
    id: 'inner', title: 'Inner cords', when: hasInner, fields: [
      { name: 'innerCordStops', kind: 'flag', label: 'Inner cord stops fitted', hint: 'Stops that keep the lift cords from being pulled into a loop.' },
      { name: 'innerCordsReachable', kind: 'flag', label: 'Inner cords within reach', hint: 'No if the lift cords run inside closed cells or a rail and cannot be reached at all.' },
      { name: 'innerLoopPullOutMm', kind: 'length', label: 'Inner cord loop pulled out', hint: 'Fully lowered, stops as fitted: pull an inner or rear cord out between the slats or folds, lay the loop flat and measure it (0 if nothing comes out).', jurisdictions: ['AU', 'CA'], when: innerReachable },
      { name: 'innerCordLoop', kind: 'flag', label: 'Inner cord pulls into a hazardous loop', hint: 'Yes if a loop a child\'s head could pass through can be pulled out, stops as fitted.', jurisdictions: ['EU', 'US'], when: innerReachable },
      { name: 'rearCordSpacingMm', kind: 'length', label: 'Rear cord spacing', hint: 'Between the rings or loops that hold the cords at the back.', jurisdictions: ['EU'], when: s => s.productType === 'roman' || s.productType === 'other' },
    ],
  },
  {
    id: 'tilt', title: 'Tilt', when: slatTilted, fields: [
      { name: 'freeTiltCord', kind: 'flag', label: 'Free-hanging tilt cord', hint: 'The slats are tilted by a hanging cord rather than a wand.', jurisdictions: ['US'] },
    ],
  },
  {
    id: 'labels', title: 'Labels left on the product', when: s => isCorded(s) || hasInner(s), fields: [
      { name: 'warningLabel', kind: 'flag', label: 'Warning label attached' },
      { name: 'swingTag', kind: 'flag', label: 'Swing tag still on the cord', jurisdictions: ['AU'], when: isCorded },
      { name: 'installerLabel', kind: 'flag', label: 'Your installer\'s label attached', jurisdictions: ['AU', 'EU'] },
      { name: 'manufacturerLabel', kind: 'flag', label: 'Maker\'s label attached', jurisdictions: ['CA', 'US', 'EU'] },
      { name: 'bilingualInformation', kind: 'flag', label: 'Information in English and French', hint: 'The product\'s warnings and instructions are in both languages.', jurisdictions: ['CA'] },
      { name: 'childFreePremisesWarning', kind: 'flag', label: 'Marked for premises without young children', jurisdictions: ['EU'], when: childFreePremises },
    ],
  },
  {
    id: 'installation', title: 'How it was installed', when: s => isCorded(s) || hasInner(s), fields: [
      { name: 'installedPerInstructions', kind: 'flag', label: 'Installed as the packaged instructions say', hint: 'Every safety device fitted where the instructions on the retail packaging put it.', jurisdictions: ['AU'] },
      { name: 'installedByBusiness', kind: 'flag', label: 'Installed by a business', hint: 'No only when the occupier fitted it themselves.', jurisdictions: ['AU'] },
    ],
  },
  {
    id: 'room', title: 'Around the window', when: s => isCorded(s) || hasInner(s), fields: [
      { name: 'climbableFurnitureNearby', kind: 'flag', label: 'Climbable furniture near the window', hint: 'A bed, cot, sofa or shelf a child could climb to reach the cord.' },
    ],
  },
]

export interface ShownGroup { id: string, title: string, fields: FittingField[] }

/**
 * The groups and fields to show: those the control and product make relevant, split into what this
 * jurisdiction's rules read (`main`) and what only other jurisdictions read (`other`).
 */
export function shownFields(s: FittingSituation): { main: ShownGroup[], other: FittingField[] } {
  const main: ShownGroup[] = []
  const other: FittingField[] = []
  for (const g of fittingGroups) {
    if (!g.when(s)) continue
    const fields = g.fields.filter(f => !f.when || f.when(s))
    const here = fields.filter(f => !f.jurisdictions || f.jurisdictions.includes(s.jurisdiction))
    other.push(...fields.filter(f => !here.includes(f)))
    if (here.length) main.push({ id: g.id, title: g.title, fields: here })
  }
  return { main, other }
}

/** Every field shown, once (deviceFixing sits in two groups). */
export function shownFieldList(s: FittingSituation): FittingField[] {
  const { main, other } = shownFields(s)
  const seen = new Set<string>()
  return [...main.flatMap(g => g.fields), ...other].filter(f => !seen.has(f.name) && seen.add(f.name))
}
