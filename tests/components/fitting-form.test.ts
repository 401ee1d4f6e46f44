import { beforeEach, describe, expect, it } from 'vitest'
import { defineComponent, h, ref } from 'vue'
import { mount } from '@vue/test-utils'
import { createPinia, setActivePinia } from 'pinia'
import type { CoveringDetail } from '#shared/types/register'
import { useFittingForm } from '~/composables/useFittingForm'
import type { FittingForm } from '~/composables/useFittingForm'
import { useFittingUnitsStore } from '~/stores/fittingUnits'
import { signedInAs } from './setup'

// The fitting form's live check: the rulebook runs in the browser on every change, as sign-off will run it.
// Figures from the Australian Competition and Consumer Commission's Safety Standard (Corded Internal Window
// Coverings) 2014, s 6(1)(a): a loop that can be pulled out more than 220 mm needs a tension device (see
// the AU rule set, rules/sets/au.ts).

const covering: CoveringDetail = {
  id: 41, siteId: 3, siteName: 'Wattle Court', jurisdiction: 'AU', openingId: 9, openingRef: 'W2', room: 'Bedroom 2', unitId: 4, unitRef: '4',
  ref: 'WAT-4-02', productType: 'roller', control: 'chain_loop', madeTo: null, mount: 'inside', fixing: 'top', controlSide: 'left',
  widthMm: 1200, dropMm: 1600, makerModel: null, manufacturedOn: null, installedOn: null, status: 'in_place', lastVerdict: null,
  lastInspectedAt: null, lastInspectionId: null, changedSinceInspection: false, changedFields: [], changedAt: null,
  clientId: 1, childrensRoom: false, inspections: [], removal: null,
}

function mountForm(prefill: Record<string, string | boolean> = {}) {
  let form!: FittingForm
  mount(defineComponent({
    setup() {
      form = useFittingForm(ref(covering), ref('rental_home'), { auditId: null, correctsId: null, prefill })
      return () => h('div')
    },
  }))
  return form
}

const finding = (form: FittingForm, clause: string) => form.check.value.result?.findings.find(f => f.clause === clause)

beforeEach(() => {
  setActivePinia(createPinia())
  signedInAs({ id: 7, name: 'Installer', role: 'installer' })
})

describe('the fitting form\'s live check', () => {
  it('fails a loop that pulls out 310 mm with no tension device, naming the limit, and passes it once held taut', () => {
    const form = mountForm()
    form.set('headHeightMm', '2100')
    form.set('lowestCordPointMm', '1000')
    form.set('loopPullOutMm', '310')
    form.set('tensionDevice', false)
    const reach = finding(form, 'au.loop-reach')
    expect(reach?.verdict).toBe('fail')
    expect(reach?.measured).toBe(310)
    expect(reach?.limit).toBe(220)
    expect(form.check.value.result?.verdict).toBe('non_compliant')

    // A device fitted after that failure clears the old pull-out and asks for it again.
    form.set('tensionDevice', true)
    expect(form.value('loopPullOutMm')).toBeNull()
    expect(form.notices.value.loopPullOutMm).toMatch(/Measure the loop again with the tension device in place/)
    form.set('loopPullOutMm', '20')
    expect(form.notices.value.loopPullOutMm).toBeUndefined()
    expect(finding(form, 'au.loop-reach')?.verdict).not.toBe('fail')
  })

  it('names a field it cannot read, leaves it out and still checks the rest', () => {
    const form = mountForm()
    form.set('headHeightMm', 'tall')
    form.set('lowestCordPointMm', '1000')
    form.set('loopPullOutMm', '310')
    form.set('tensionDevice', false)
    expect(form.errors.value.headHeightMm).toMatch(/^Top of the head rail “tall” is not a number/)
    expect(form.check.value.measurements.headHeightMm).toBeNull()
    expect(finding(form, 'au.loop-reach')?.verdict).toBe('fail')
  })

  it('reads a length in the unit chosen beside it, and keeps that unit when the preferred one changes', () => {
    const form = mountForm({ tensionDevice: false, lowestCordPointMm: '1000' })
    form.setUnit('loopPullOutMm', 'in')
    form.set('loopPullOutMm', '10')
    expect(form.check.value.measurements.loopPullOutMm).toBe(254)
    expect(finding(form, 'au.loop-reach')?.measured).toBe(254)

    // The installer's preferred unit applies to a field typed from then on; a field already typed keeps its own.
    useFittingUnitsStore().setUnit('in')
    form.set('headHeightMm', '82 1/2')
    expect(form.unit('headHeightMm')).toBe('in')
    expect(form.check.value.measurements.headHeightMm).toBe(2095.5)
    useFittingUnitsStore().setUnit('mm')
    expect(form.unit('headHeightMm')).toBe('in')
    form.setUnit('loopPullOutMm', 'mm')
    expect(form.check.value.measurements.loopPullOutMm).toBe(10)
  })

  it('warns when the device sits above the loop\'s lowest point', () => {
    const form = mountForm({ tensionDevice: true })
    form.set('lowestCordPointMm', '1000')
    form.set('tensionDeviceHeightMm', '1100')
    expect(form.notices.value.tensionDeviceHeightMm).toMatch(/The device is 1100 mm up but the loop reaches down to 1000 mm/)
    form.set('tensionDeviceHeightMm', '900')
    expect(form.notices.value.tensionDeviceHeightMm).toBeUndefined()
  })

  it('stores nothing until the first change, and signs off what was measured, in millimetres, with one client key', () => {
    const form = mountForm()
    expect(form.draft.value).toBeNull()
    form.setUnit('loopPullOutMm', 'in')
    form.set('loopPullOutMm', '8')
    const first = form.signOffBody()
    expect(first.body.kind).toBe('fitting')
    expect(first.body.measurements.loopPullOutMm).toBe(203.2)
    expect(first.control).toBeNull()
    form.setControl('free_cord')
    const second = form.signOffBody()
    expect(second.body.clientKey).toBe(first.body.clientKey)
    expect(second.control).toBe('free_cord')
  })
})
