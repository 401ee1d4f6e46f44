import type { ComputedRef, InjectionKey, Ref } from 'vue'
import type { ControlType, Jurisdiction, ProductType } from '~/rules'
import type { CoveringDetail } from '#shared/types/register'
import type { FittingDraft, SignOffBody } from '~/stores/fittingDrafts'
import { fittingGroups, shownFieldList, shownFields } from './fittingFields'
import type { FittingField, FittingSituation, ShownGroup } from './fittingFields'
import { liveCheck } from './fittingRecord'
import type { DraftValue, FittingContext, LiveCheck } from './fittingRecord'
import type { LengthUnit } from './measure'

export interface FittingForm {
  draft: ComputedRef<FittingDraft | null>
  control: ComputedRef<ControlType>
  jurisdiction: ComputedRef<Jurisdiction>
  groups: ComputedRef<{ main: ShownGroup[], other: FittingField[] }>
  check: ComputedRef<LiveCheck>
  /** Field messages: what cannot be read, what the schema refuses, and what the server refused. */
  errors: ComputedRef<Record<string, string>>
  /** Prompts and warnings by field that are not errors: re-measure the loop, a device fixed above the loop. */
  notices: ComputedRef<Record<string, string>>
  value: (name: string) => DraftValue
  unit: (name: string) => LengthUnit
  set: (name: string, value: DraftValue) => void
  setUnit: (name: string, unit: LengthUnit) => void
  setControl: (control: ControlType) => void
  setNotes: (text: string) => void
  /** Makes the draft (and its one clientKey) when it does not exist yet. */
  ensure: () => FittingDraft
  discard: () => void
  signOffBody: () => { body: SignOffBody, control: ControlType | null }
}

export const fittingFormKey: InjectionKey<FittingForm> = Symbol('fittingForm')

/** Fields a failing loop clause reads: a device fitted after one of these failed changes what can be pulled out. */
const loopFields = new Set(['loopPullOutMm', 'loopPerimeterMm', 'lowestCordPointMm', 'tensionDevice', 'operatingCordLengthMm'])

/** The warnings about where a tension device sits, from the measurements as read (mm above the floor). */
export function deviceNotices(m: Record<string, unknown>): Record<string, string> {
  const device = m.tensionDeviceHeightMm
  const lowest = m.lowestCordPointMm
  if (m.tensionDevice !== true || typeof device !== 'number' || typeof lowest !== 'number' || device <= lowest) return {}
  return {
    tensionDeviceHeightMm: `The device is ${device} mm up but the loop reaches down to ${lowest} mm, below it: a device above the loop's lowest point does not hold it taut. `
      + 'Fix it at the bottom of the loop, pulled taut and eased back about 10 mm so the chain still runs (common practice), then measure both again.',
  }
}

/** An earlier inspection's measured values as typed text, to start a correction from. */
export function valuesFromRecord(record: Record<string, unknown>): Record<string, DraftValue> {
  const out: Record<string, DraftValue> = {}
  for (const f of fittingGroups.flatMap(g => g.fields)) {
    const v = record[f.name]
    if (typeof v === 'number') out[f.name] = String(v)
    else if (typeof v === 'boolean' || typeof v === 'string') out[f.name] = v
  }
  return out
}

/** The fitting form of one covering over its draft in the store; nothing is stored until the first change. */
export function useFittingForm(covering: Ref<CoveringDetail>, premises: Ref<string>, options: { auditId: number | null, correctsId: number | null, prefill: Record<string, DraftValue> }) {
  const store = useFittingDraftsStore()
  const units = useFittingUnitsStore()
  const { user } = useUserSession()
  const userId = computed(() => user.value?.id ?? 0)

  const draft = computed(() => store.find(userId.value, covering.value.id))
  const control = computed(() => draft.value?.control ?? (covering.value.control as ControlType))
  const jurisdiction = computed(() => covering.value.jurisdiction as Jurisdiction)
  const values = computed<Record<string, DraftValue>>(() => draft.value?.values ?? options.prefill)
  const situation = computed<FittingSituation>(() => ({ control: control.value, productType: covering.value.productType as ProductType, jurisdiction: jurisdiction.value, premises: premises.value, values: values.value }))
  const groups = computed(() => shownFields(situation.value))
  const fields = computed(() => shownFieldList(situation.value))
  const context = computed<FittingContext>(() => ({ ...covering.value, premises: premises.value }))
  // Set when a tension device is fitted after a failing loop: the pull-out from before no longer holds.
  const remeasureLoop = ref(false)
  const unit = (name: string): LengthUnit => draft.value?.units[name] ?? units.unit
  const unitMap = computed(() => Object.fromEntries(fields.value.map(f => [f.name, unit(f.name)])))
  const check = computed(() => liveCheck(context.value, control.value, fields.value, values.value, unitMap.value))
  // A server refusal about a field marks that field; one about the visit as a whole (photoIds) is the draft's problem.
  const errors = computed(() => ({
    ...check.value.errors,
    ...Object.fromEntries(Object.entries(draft.value?.serverErrors ?? {}).filter(([k]) => fields.value.some(f => f.name === k))),
  }))
  const notices = computed(() => {
    const out = deviceNotices(check.value.measurements)
    if (remeasureLoop.value && values.value.tensionDevice === true && !values.value.loopPullOutMm) {
      out.loopPullOutMm = 'Measure the loop again with the tension device in place: pull it out as far as it comes, lay it flat and record the new figure. The figure from before the device was fitted has been cleared.'
    }
    return out
  })

  function ensure(): FittingDraft {
    const c = covering.value
    return store.start({
      userId: userId.value, coveringId: c.id, control: c.control as ControlType, values: { ...options.prefill },
      label: { ref: c.ref, siteName: c.siteName, unitRef: c.unitRef, room: c.room }, auditId: options.auditId, correctsId: options.correctsId,
    })
  }

  function signOffBody() {
    const d = ensure()
    const kind = d.correctsId ? 'correction' : d.auditId ? 'audit' : 'fitting'
    const body: SignOffBody = {
      kind, measurements: check.value.measurements, notes: d.notes.trim() || null, clientKey: d.clientKey,
      inspectedAt: new Date().toISOString(), correctsId: d.correctsId, auditId: d.auditId,
    }
    return { body, control: d.control !== covering.value.control ? d.control : null }
  }

  const form: FittingForm = {
    draft, control, jurisdiction, groups, check, errors, notices, signOffBody, ensure,
    value: name => values.value[name] ?? null,
    unit,
    set: (name, value) => {
      const d = ensure()
      // A length keeps the unit it was typed in, even if the preferred unit changes later.
      d.units[name] ??= units.unit
      const loopFailed = check.value.result?.findings.some(f => f.verdict === 'fail' && f.field !== null && loopFields.has(f.field)) ?? false
      if (name === 'tensionDevice' && value === true && d.values.tensionDevice !== true && loopFailed && d.values.loopPullOutMm) {
        // A device changes what a child can pull out: the old pull-out is cleared, and the form asks for it again.
        store.setValue(d, 'loopPullOutMm', null)
        remeasureLoop.value = true
      }
      if (name === 'loopPullOutMm' && value) remeasureLoop.value = false
      store.setValue(d, name, value)
    },
    setUnit: (name, next) => {
      const d = ensure()
      d.units[name] = next
      store.touch(d)
    },
    setControl: (next) => {
      const d = ensure()
      d.control = next
      store.touch(d)
    },
    setNotes: (text) => {
      const d = ensure()
      d.notes = text
      store.touch(d)
    },
    discard: () => {
      if (draft.value) store.remove(draft.value.key)
    },
  }
  return form
}
