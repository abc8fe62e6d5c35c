import { describe, expect, it } from 'vitest'
import { formatFromLog10, formatNumber, numberParts, tickParts } from '../../../shared/charts/format'
import { linearAxis, logAxis } from '../../../shared/charts/axes'

describe('formatNumber', () => {
  it.each([
    [0, '0'],
    [0.25, '0.25'],
    [1, '1'],
    [-3, '−3'],
    [0.0012345, '0.00123'],
    [12345, '12300'],
    [123456, '1.23×10⁵'],
    [1.5e-8, '1.5×10⁻⁸'],
    [1e-5, '10⁻⁵'],
    [-2.5e12, '−2.5×10¹²'],
    [9.9996e-4, '0.001'],
  ])('%s -> %s', (value, text) => {
    expect(formatNumber(value)).toBe(text)
  })

  it('never prints NaN or Infinity', () => {
    for (const value of [NaN, Infinity, -Infinity]) expect(formatNumber(value)).toBe('—')
  })

  it('keeps the exponent apart for raised drawing in SVG', () => {
    expect(numberParts(3.2e-7)).toEqual({ base: '3.2×10', exponent: '−7' })
  })

  it('formats populations known only by their log10, below the smallest double', () => {
    expect(formatFromLog10(-400.3)).toBe('5.01×10⁻⁴⁰¹')
    expect(formatFromLog10(-2)).toBe('0.01')
    expect(formatFromLog10(-Infinity)).toBe('0')
  })
})

describe('tick labels', () => {
  it('use as many decimals as the step needs', () => {
    expect(tickParts([0, 0.25, 0.5]).map((parts) => parts.base)).toEqual(['0.00', '0.25', '0.50'])
    expect(tickParts([-1, 0, 1]).map((parts) => parts.base)).toEqual(['−1', '0', '1'])
  })

  it('linear 0..1 gives d3 nice ticks 0, 0.2, …, 1', () => {
    const axis = linearAxis(0, 1, 5)
    expect(axis.domain).toEqual([0, 1])
    expect(axis.ticks.map((tick) => tick.value)).toEqual([0, 0.2, 0.4, 0.6, 0.8, 1])
    expect(axis.ticks.map((tick) => tick.label.base)).toEqual(['0.0', '0.2', '0.4', '0.6', '0.8', '1.0'])
  })

  it('linear axis is extended to nice values', () => {
    const axis = linearAxis(0.013, 0.987, 5)
    expect(axis.domain).toEqual([0, 1])
  })

  it('log axis over 1e-6..1 labels every decade as a power of ten, with minor ticks', () => {
    const axis = logAxis(-6, 0, 7)
    expect(axis.domain).toEqual([-6, 0])
    expect(axis.ticks.map((tick) => tick.value)).toEqual([-6, -5, -4, -3, -2, -1, 0])
    expect(axis.ticks[1]!.label).toEqual({ base: '10', exponent: '−5' })
    expect(axis.minorTicks).toHaveLength(6 * 8)
    for (const value of axis.minorTicks) expect(value).toBeGreaterThan(-6)
  })

  it('log axis over hundreds of decades steps in round numbers of decades', () => {
    const axis = logAxis(-420, 0, 6)
    const values = axis.ticks.map((tick) => tick.value)
    expect(values.length).toBeLessThanOrEqual(7)
    expect(values[0]).toBeLessThanOrEqual(-420)
    expect(values.every((value) => value % 100 === 0)).toBe(true)
  })

  it('log axis within one decade still has several labelled ticks', () => {
    const axis = logAxis(Math.log10(2), Math.log10(8), 6)
    expect(axis.ticks.length).toBeGreaterThanOrEqual(3)
  })

  it('a single value or all-equal values give a usable axis', () => {
    for (const axis of [linearAxis(5, 5, 5), linearAxis(0, 0, 5), logAxis(-3, -3, 5), linearAxis(-1e308, 1e308, 5)]) {
      expect(axis.domain[0]).toBeLessThan(axis.domain[1])
      expect(axis.ticks.length).toBeGreaterThanOrEqual(2)
      expect(axis.ticks.every((tick) => Number.isFinite(tick.value))).toBe(true)
    }
  })
})
