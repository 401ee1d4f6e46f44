/** Millimetres in one inch, exactly, by definition (1959 international inch). */
export const MM_PER_INCH = 25.4

/** Inches to millimetres (1 in = 25.4 mm exactly, by definition). */
export function inchesToMm(inches: number): number {
  return inches * MM_PER_INCH
}

/** Millimetres to inches (1 in = 25.4 mm exactly, by definition). */
export function mmToInches(mm: number): number {
  return mm / MM_PER_INCH
}
