import { describe, expect, it } from 'vitest'
import { idValue, multilineText, optionalText, refText, requiredText, wholeNumber } from '../../shared/schemas/common'

// The shared text and number helpers every schema in shared/schemas builds on.

const controls = [...Array.from({ length: 32 }, (_, i) => i), 0x7F].map(c => String.fromCharCode(c))

describe('one-line text (requiredText, optionalText, refText)', () => {
  it('refuses every C0 control character and DEL, inside or at the ends, naming the field and the character', () => {
    for (const c of controls) {
      for (const value of [`a${c}b`, `ab${c}`, `${c}ab`]) {
        const r = requiredText(50, 'name').safeParse(value)
        expect(r.success, JSON.stringify(value)).toBe(false)
        expect(r.error!.issues[0]!.message).toMatch(/^name holds a control character \(U\+00[0-9A-F]{2}\)/)
        expect(optionalText(50, 'floor').safeParse(value).success, JSON.stringify(value)).toBe(false)
        expect(refText('ref').safeParse(value).success, JSON.stringify(value)).toBe(false)
      }
    }
  })

  it('keeps ordinary text, trimmed, and reads empty optional text as null', () => {
    expect(requiredText(50, 'name').parse('  Flat 2 — upstairs ')).toBe('Flat 2 — upstairs')
    expect(optionalText(50, 'floor').parse('')).toBeNull()
    expect(optionalText(50, 'floor').parse(null)).toBeNull()
    expect(refText('ref').parse('W1/2 #3')).toBe('W1/2 #3')
  })
})

describe('multilineText(max, field)', () => {
  it('keeps tab, line feed and carriage return, and refuses every other control character', () => {
    expect(multilineText(100, 'notes').parse('Key: caretaker\n\tgate 1234\r\nCall first')).toBe('Key: caretaker\n\tgate 1234\r\nCall first')
    for (const c of controls.filter(c => !['\t', '\n', '\r'].includes(c))) {
      const r = multilineText(100, 'notes').safeParse(`a${c}b`)
      expect(r.success, JSON.stringify(c)).toBe(false)
      expect(r.error!.issues[0]!.message).toMatch(/^notes holds a control character/)
    }
    expect(multilineText(5, 'notes').safeParse('123456').error!.issues[0]!.message).toBe('notes is at most 5 characters')
  })
})

describe('ids and whole numbers', () => {
  it('take numbers or plain digits, never true, \'\', exponents, signs or hex', () => {
    expect(idValue('siteId').parse('42')).toBe(42)
    expect(idValue('siteId').parse(42)).toBe(42)
    for (const bad of [true, false, '', ' 1', '1e3', '+1', '-1', '0x10', 1.5, 0, null, [1], '99999999999']) {
      expect(idValue('siteId').safeParse(bad).success, JSON.stringify(bad)).toBe(false)
      if (bad !== 0) expect(wholeNumber('page').safeParse(bad).success, JSON.stringify(bad)).toBe(false)
    }
  })
})

describe('import text cells', () => {
  it('refuse a control character or line break, as the register\'s own forms do', async () => {
    const { importColumnByName, readCell } = await import('../../shared/schemas/imports')
    const address = importColumnByName.get('address')!
    expect(readCell(address, '1 Plain St')).toEqual({ value: '1 Plain St' })
    for (const c of ['\u0007', '\n', '\u001B', '\u007F']) expect(readCell(address, `1 Plain${c}St`)).toMatchObject({ error: expect.stringMatching(/control character/) })
  })
})
