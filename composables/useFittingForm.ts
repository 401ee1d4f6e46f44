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
  const unit = (name: string): LengthUnit => draft.value?.units[name] ?? units.unit
  const unitMap = computed(() => Object.fromEntries(fields.value.map(f => [f.name, unit(f.name)])))
  const check = computed(() => liveCheck(context.value, control.value, fields.value, values.value, unitMap.value))
  // A server refusal about a field marks that field; one about the visit as a whole (photoIds) is the draft's problem.
  const errors = computed(() => ({
    ...check.value.errors,
    ...Object.fromEntries(Object.entries(draft.value?.serverErrors ?? {}).filter(([k]) => fields.value.some(f => f.name === k))),
  }))

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
    draft, control, jurisdiction, groups, check, errors, signOffBody, ensure,
    value: name => values.value[name] ?? null,
    unit,
    set: (name, value) => {
      const d = ensure()
      // A length keeps the unit it was typed in, even if the preferred unit changes later.
      d.units[name] ??= units.unit
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
