// Rounding rules: the uncertainty to two significant figures and the value to the same decimal
// place (JCGM 100:2008, Guide to the expression of uncertainty in measurement, §7.2.6);
// significant figures otherwise (common practice). Each row is worked by hand.
import { describe, expect, it } from 'vitest'
import { formatFromLog10, formatSignificant, formatWithUncertainty, significantFigures } from '../../../shared/present/numbers'

describe('formatSignificant', () => {
  const table: [number, number, string][] = [
    [0.39838163013316197, 6, '0.398382'],
    [0.39838163013316197, 4, '0.3984'],
    [0.39838163013316197, 10, '0.3983816301'],
    [298.15, 6, '298.150'],
    // 298.15 is stored as 298.149999…, so four figures are 298.1; 298.16 shows the rounding up.
    [298.15, 4, '298.1'],
    [298.16, 4, '298.2'],
    [-12.3456789, 6, '−12.3457'],
    [-12.3456789, 10, '−12.34567890'],
    [6.02214076e23, 6, '6.02214×10²³'],
    [6.02214076e23, 4, '6.022×10²³'],
    [6.02214076e23, 10, '6.022140760×10²³'],
    [1.380649e-23, 4, '1.381×10⁻²³'],
    [-2.5e-7, 6, '−2.50000×10⁻⁷'],
    [0.00099999, 4, '0.001000'],
    [999999.6, 6, '1.00000×10⁶'],
    [123456.7, 6, '123457'],
    [0, 6, '0'],
  ]
  it.each(table)('%d to %d significant figures is %s', (value, digits, expected) => {
    expect(formatSignificant(value, digits)).toBe(expected)
  })
  it('writes a non-number as a dash, never as a number', () => {
    expect(formatSignificant(Number.NaN)).toBe('—')
    expect(formatSignificant(Infinity)).toBe('—')
  })
  it('keeps the setting inside 4–10 with six as the default', () => {
    expect(significantFigures(undefined)).toBe(6)
    expect(significantFigures(2)).toBe(4)
    expect(significantFigures(15)).toBe(10)
  })
})

describe('formatWithUncertainty', () => {
  const table: [number, number, string][] = [
    [2987.3, 40.7, '2987 ± 41'],
    [2987.3, 4.07, '2987.3 ± 4.1'],
    [2987.3, 0.0407, '2987.300 ± 0.041'],
    [-1.23456, 0.00123, '−1.2346 ± 0.0012'],
    [1.23456e-5, 5.6e-8, '(1.2346 ± 0.0056)×10⁻⁵'],
    [6.0221e23, 3.1e20, '(6.0221 ± 0.0031)×10²³'],
    // 995 to two figures is 1.0×10³: both round to the hundreds.
    [2987.3, 995, '3000 ± 1000'],
    [150, 4070, '200 ± 4100'],
  ]
  it.each(table)('%d ± %d is %s', (value, uncertainty, expected) => {
    expect(formatWithUncertainty(value, uncertainty, 6).text).toBe(expected)
  })
  it('falls back to significant figures when there is no uncertainty', () => {
    expect(formatWithUncertainty(2987.3, 0, 4).text).toBe('2987')
    expect(formatWithUncertainty(2987.3, Number.NaN, 6).text).toBe('2987.30')
  })
})

describe('formatFromLog10', () => {
  it('writes numbers below a double from their logarithm', () => {
    // 10^-400.3 = 10^0.7 × 10^-401 = 5.01187… × 10^-401 (10^0.7 = 5.011872336, common logarithm table).
    expect(formatFromLog10(-400.3, 6)).toBe('5.01187×10⁻⁴⁰¹')
    expect(formatFromLog10(-2, 4)).toBe('0.01000')
    expect(formatFromLog10(-Infinity)).toBe('0')
  })
})
