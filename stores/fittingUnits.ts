import { defineStore } from 'pinia'
import type { LengthUnit } from '~/composables/measure'

const KEY = 'tautline.lengthUnit'

/** The unit this installer types lengths in by default (mm, or inches from an imperial tape); kept per browser. */
export const useFittingUnitsStore = defineStore('fittingUnits', () => {
  const unit = ref<LengthUnit>('mm')
  let loaded = false

  function load() {
    if (loaded || !import.meta.client) return
    loaded = true
    unit.value = localStorage.getItem(KEY) === 'in' ? 'in' : 'mm'
  }

  function setUnit(next: LengthUnit) {
    unit.value = next
    if (import.meta.client) localStorage.setItem(KEY, next)
  }

  return { unit, load, setUnit }
})
