import { describe, expect, it } from 'vitest'
import { mount } from '@vue/test-utils'
import { parseForce, parseLength, showMm } from '~/composables/measure'
import LengthInput from '~/components/fitting/LengthInput.vue'
import FieldNotes from '~/components/FieldNotes.vue'

// 1 in = 25.4 mm exactly (the international inch, 1959); the form keeps inches to a tenth of a millimetre.
describe('reading a typed length', () => {
  it('takes a bare number in the unit chosen beside the field', () => {
    expect(parseLength('1600', 'mm')).toEqual({ mm: 1600, error: null })
    expect(parseLength('10', 'in')).toEqual({ mm: 254, error: null })
    expect(parseLength('82 1/2', 'in')).toEqual({ mm: 2095.5, error: null })
  })

  it('lets a written unit win over the chosen one', () => {
    expect(parseLength('160cm', 'in')).toEqual({ mm: 1600, error: null })
    expect(parseLength('63in', 'mm')).toEqual({ mm: 1600.2, error: null })
    expect(parseLength('8"', 'mm')).toEqual({ mm: 203.2, error: null })
  })

  it('keeps 8.01 in above the 8 in (203.2 mm) mark instead of rounding it to whole millimetres', () => {
    expect(parseLength('8.01', 'in').mm).toBeGreaterThan(203.2)
  })

  it('treats blank text as not recorded, and names what is wrong with the rest', () => {
    expect(parseLength('', 'mm')).toEqual({ mm: null, error: null })
    expect(parseLength('   ', 'in')).toEqual({ mm: null, error: null })
    expect(parseLength('abc', 'mm').error).toMatch(/“abc” is not a number; write it in millimetres/)
    expect(parseLength('1,600', 'mm').error).toMatch(/thousands separators/)
    expect(parseLength('1600 1/2', 'mm').error).toMatch(/fractions are for inches/)
    expect(parseLength('70N', 'mm').error).toMatch(/is a force/)
  })

  it('reads forces in newtons and refuses lengths there', () => {
    expect(parseForce('70')).toEqual({ n: 70, error: null })
    expect(parseForce('70N')).toEqual({ n: 70, error: null })
    expect(parseForce('70mm').error).toMatch(/is a length/)
    expect(parseForce(null)).toEqual({ n: null, error: null })
  })

  it('shows millimetres whole, or to a tenth when converted', () => {
    expect(showMm(1600)).toBe('1,600 mm')
    expect(showMm(2095.5)).toBe('2,095.5 mm')
  })
})

describe('the length field and its mm / in switch', () => {
  const mountField = (props: Record<string, unknown>) => mount(LengthInput, {
    props: { label: 'Largest loop pulled out', text: null, unit: 'mm', ...props },
    global: { components: { FieldNotes } },
  })

  it('names the unit in the label and marks the chosen unit pressed', () => {
    const w = mountField({ unit: 'mm' })
    expect(w.find('label').text()).toBe('Largest loop pulled out (mm)')
    const [mm, inch] = w.findAll('[role="group"] button')
    expect(mm!.attributes('aria-pressed')).toBe('true')
    expect(inch!.attributes('aria-pressed')).toBe('false')
    expect(w.find('[role="group"]').attributes('aria-label')).toBe('Unit for Largest loop pulled out')
  })

  it('asks for the other unit when its button is pressed, and passes typed text up as typed', async () => {
    const w = mountField({ unit: 'mm' })
    await w.findAll('[role="group"] button')[1]!.trigger('click')
    expect(w.emitted('update:unit')).toEqual([['in']])
    await w.find('input').setValue('12 1/4')
    expect(w.emitted('update:text')).toEqual([['12 1/4']])
  })

  it('shows inches in millimetres at once, since millimetres are what is saved', async () => {
    const w = mountField({ unit: 'in', text: '10' })
    expect(w.find('label').text()).toBe('Largest loop pulled out (in)')
    const note = w.find('p.text-spruce-800')
    expect(note.text()).toBe('= 254 mm, saved in millimetres')
    expect(w.find('input').attributes('aria-describedby')).toContain(note.attributes('id'))
    await w.setProps({ unit: 'mm' })
    expect(w.find('p.text-spruce-800').exists()).toBe(false)
  })

  it('marks the field invalid and ties the message to it', () => {
    const w = mountField({ text: 'abc', error: 'Largest loop pulled out "abc" is not a number' })
    const input = w.find('input')
    expect(input.attributes('aria-invalid')).toBe('true')
    expect(w.text()).toContain('"abc" is not a number')
  })

  it('has no unit switch for a force', () => {
    const w = mountField({ label: 'Pull test: force held', force: true })
    expect(w.find('label').text()).toBe('Pull test: force held (N)')
    expect(w.find('[role="group"]').exists()).toBe(false)
  })
})
