// Property-based checks (fast-check) of invariants every correct Boltzmann engine keeps.
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { BOLTZMANN_CONSTANT, GAS_CONSTANT, PLANCK_CONSTANT, SPEED_OF_LIGHT, evaluate, toJoules, toKelvin } from '../../../shared/thermo/index'

const level = fc.record({ energy: fc.double({ min: 0, max: 50_000, noNaN: true }), degeneracy: fc.integer({ min: 1, max: 20 }) })
const levelList = fc.array(level, { minLength: 1, maxLength: 40 })
const temperature = fc.double({ min: 0.5, max: 1e5, noNaN: true })

function levels(list: { energy: number; degeneracy: number }[], kelvin: number, shift = 0) {
  return evaluate({
    kind: 'levels',
    input: { levels: list.map((item) => ({ energy: `${item.energy + shift} cm^-1`, degeneracy: item.degeneracy })), temperature: `${kelvin} K` },
  }).result
}

describe('levels invariants', () => {
  it('fractions sum to one and log10Fraction is always finite', () => {
    fc.assert(
      fc.property(levelList, temperature, (list, kelvin) => {
        const result = levels(list, kelvin)
        const sum = result.levels.reduce((total: number, item: { fraction: number }) => total + item.fraction, 0)
        expect(Math.abs(sum - 1)).toBeLessThan(1e-12)
        for (const item of result.levels) expect(Number.isFinite(item.log10Fraction)).toBe(true)
      }),
      { numRuns: 200 },
    )
  })

  it('shifting every energy leaves the populations unchanged', () => {
    fc.assert(
      fc.property(levelList, temperature, fc.double({ min: -1e4, max: 1e5, noNaN: true }), (list, kelvin, shift) => {
        const plain = levels(list, kelvin)
        const shifted = levels(list, kelvin, shift)
        plain.levels.forEach((item: { fraction: number; log10Fraction: number }, index: number) => {
          expect(Math.abs(shifted.levels[index].fraction - item.fraction)).toBeLessThan(1e-9)
          expect(Math.abs(shifted.levels[index].log10Fraction - item.log10Fraction)).toBeLessThan(1e-6 * Math.max(1, Math.abs(item.log10Fraction)))
        })
        expect(Math.abs(shifted.molarEntropy - plain.molarEntropy)).toBeLessThan(1e-6 * Math.max(1, plain.molarEntropy))
      }),
      { numRuns: 150 },
    )
  })

  it('q (from the lowest level) is at least the ground degeneracy', () => {
    fc.assert(
      fc.property(levelList, temperature, (list, kelvin) => {
        const result = levels(list, kelvin)
        const lowest = Math.min(...list.map((item) => item.energy))
        const groundDegeneracy = list.filter((item) => item.energy === lowest).reduce((sum, item) => sum + item.degeneracy, 0)
        expect(result.partitionFunctionFromLowest).toBeGreaterThanOrEqual(groundDegeneracy * (1 - 1e-12))
      }),
      { numRuns: 200 },
    )
  })

  it('at very high temperature populations approach g_i / Σg (classical limit)', () => {
    fc.assert(
      fc.property(levelList, (list) => {
        const result = levels(list, 1e12)
        const total = list.reduce((sum, item) => sum + item.degeneracy, 0)
        result.levels.forEach((item: { fraction: number }, index: number) => {
          expect(Math.abs(item.fraction - list[index]!.degeneracy / total)).toBeLessThan(1e-5)
        })
      }),
      { numRuns: 100 },
    )
  })

  it('extreme E/kT never gives NaN or Infinity', () => {
    fc.assert(
      fc.property(fc.double({ min: 1, max: 1e7, noNaN: true }), fc.double({ min: 1e-3, max: 10, noNaN: true }), (energy, kelvin) => {
        const result = evaluate({ kind: 'levels', input: { levels: [{ energy: '0 cm^-1' }, { energy: `${energy} cm^-1` }], temperature: `${kelvin} K` } })
        expect(() => JSON.stringify(result)).not.toThrow()
        expect(Number.isFinite(result.result.levels[1].log10Fraction)).toBe(true)
        const x = (energy * 100 * PLANCK_CONSTANT * SPEED_OF_LIGHT) / (BOLTZMANN_CONSTANT * kelvin)
        const expected = -x / Math.LN10 - Math.log10(1 + Math.exp(-x))
        expect(Math.abs(result.result.levels[1].log10Fraction - expected)).toBeLessThan(1e-9 * Math.max(1, Math.abs(expected)))
      }),
      { numRuns: 100 },
    )
  })
})

describe('classical limits at high temperature', () => {
  it('harmonic oscillator: C_V → R and q → kT/hcν̃', () => {
    fc.assert(
      fc.property(fc.double({ min: 10, max: 3000, noNaN: true }), (wavenumber) => {
        const kelvin = 1000 * wavenumber * 1.4388
        const result = evaluate({ kind: 'vibration', input: { modes: [{ wavenumber: `${wavenumber} cm^-1` }], temperature: `${kelvin} K` } }).result
        expect(Math.abs(result.molarHeatCapacity / GAS_CONSTANT - 1)).toBeLessThan(1e-5)
        const classical = (BOLTZMANN_CONSTANT * kelvin) / (PLANCK_CONSTANT * SPEED_OF_LIGHT * 100 * wavenumber)
        expect(Math.abs(result.partitionFunction / classical - 1)).toBeLessThan(1e-3)
      }),
      { numRuns: 50 },
    )
  })
  it('linear rotor: exact sum → T/(σΘ)(1 + Θ/3T), C_V → R', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.1, max: 20, noNaN: true }), fc.integer({ min: 1, max: 2 }), (constant, sigma) => {
        const theta = constant * 1.4388
        const result = evaluate({ kind: 'rotation', input: { rotationalConstant: `${constant} cm^-1`, symmetryNumber: sigma, temperature: `${200 * theta} K` } }).result
        expect(Math.abs(result.partitionFunction / result.correctedHighTemperaturePartitionFunction - 1)).toBeLessThan(1e-5)
        expect(Math.abs(result.molarHeatCapacity / GAS_CONSTANT - 1)).toBeLessThan(1e-4)
      }),
      { numRuns: 50 },
    )
  })
})

describe('unit conversions round-trip', () => {
  const h = PLANCK_CONSTANT
  const c = SPEED_OF_LIGHT
  const k = BOLTZMANN_CONSTANT
  it('one energy in every unit gives the same joules', () => {
    fc.assert(
      fc.property(fc.double({ min: 1e-3, max: 1e5, noNaN: true }), (wavenumber) => {
        const joules = toJoules(`${wavenumber} cm^-1`)
        const forms = [
          `${joules} J`,
          `${joules / 1.602176634e-19} eV`,
          `${(joules * 6.02214076e23) / 1000} kJ/mol`,
          `${joules / h / 1e9} GHz`,
          `${joules / k} K`,
          `${wavenumber} 1/cm`,
          `${wavenumber * 100} m^-1`,
        ]
        for (const form of forms) expect(Math.abs(toJoules(form) / joules - 1)).toBeLessThan(1e-12)
        expect(Math.abs(joules / (h * c * 100) / wavenumber - 1)).toBeLessThan(1e-12)
      }),
      { numRuns: 200 },
    )
  })
  it('temperatures in K, degC and degF agree', () => {
    fc.assert(
      fc.property(fc.double({ min: 1, max: 5000, noNaN: true }), (kelvin) => {
        expect(Math.abs(toKelvin(`${kelvin - 273.15} degC`) - kelvin)).toBeLessThan(1e-9 * kelvin)
        expect(Math.abs(toKelvin(`${(kelvin - 273.15) * 1.8 + 32} degF`) - kelvin)).toBeLessThan(1e-9 * kelvin)
      }),
      { numRuns: 200 },
    )
  })
})
