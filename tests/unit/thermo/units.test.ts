// The units people type (issue 16): every unit parsed to SI and checked against the conversion
// factors of the SI Brochure (BIPM, 9th ed., 2019, Tables 8 and 9, and the 8th ed., 2006,
// Table 8 for the ångström, bar, mmHg and gauss), CODATA 2018 (Tiesinga et al., Rev. Mod.
// Phys. 93, 025010 (2021)) and NIST SP 811 (2008), Appendix B.8. The factors are written out
// here from those tables, not taken from the engine's constants.
import { describe, expect, it } from 'vitest'
import { EngineInputError, energyFactor, evaluate, parseQuantity, toHertz, toJoules, toKelvin, toKilogramsPerMole, toPascal, toTesla } from '../../../shared/thermo/index'
import { spectroscopicUnit } from '../../../shared/thermo/units'

// h c in J m: h and c are exact (SI Brochure, Table 1).
const HC = 6.62607015e-34 * 299792458

function relative(value: number, reference: number): number {
  return Math.abs(value / reference - 1)
}

describe('unit table: each unit to SI', () => {
  it.each([
    // [typed, converter, SI value of the quantity, source]
    ['1 cm-1', toJoules, HC * 100, 'wavenumber 1 cm⁻¹ = 100 m⁻¹, E = hcν̃'],
    ['1 cm⁻¹', toJoules, HC * 100, 'same, superscript notation'],
    ['1 1/cm', toJoules, HC * 100, 'same, as a fraction'],
    ['1 cm^-1', toJoules, HC * 100, 'same, caret notation'],
    ['1 MHz', toJoules, 6.62607015e-34 * 1e6, 'E = hν, SI prefix mega'],
    ['1 GHz', toJoules, 6.62607015e-34 * 1e9, 'SI prefix giga'],
    ['1 THz', toJoules, 6.62607015e-34 * 1e12, 'SI prefix tera'],
    ['1 eV', toJoules, 1.602176634e-19, 'electronvolt, exact (SI Brochure Table 8)'],
    ['1 meV', toJoules, 1.602176634e-22, 'milli-electronvolt'],
    ['1 hartree', toJoules, 4.3597447222071e-18, 'Hartree energy (CODATA 2018)'],
    ['1 Eh', toJoules, 4.3597447222071e-18, 'Hartree energy, symbol E_h'],
    ['1 kJ/mol', toJoules, 1000 / 6.02214076e23, 'molar energy over N_A (exact N_A)'],
    ['1 kcal/mol', toJoules, 4184 / 6.02214076e23, 'thermochemical calorie 4.184 J (NIST SP 811)'],
    ['1 K', toJoules, 1.380649e-23, 'temperature equivalent E = kT (exact k)'],
    ['500 nm', toJoules, HC / 500e-9, 'vacuum wavelength, E = hc/λ'],
    ['10 µm', toJoules, HC / 10e-6, 'vacuum wavelength in micrometres'],
    ['1000 Å', toJoules, HC / 1000e-10, 'ångström = 10⁻¹⁰ m (SI Brochure 8th ed., Table 8)'],
  ] as const)('%s in joules', (typed, convert, reference, _source) => {
    expect(relative(convert(typed), reference)).toBeLessThan(1e-15)
  })

  it.each([
    ['1 K', 1, 'kelvin'],
    ['1 mK', 1e-3, 'SI prefix milli'],
    ['1 µK', 1e-6, 'micro sign U+00B5'],
    ['1 μK', 1e-6, 'Greek mu U+03BC'],
    ['1 uK', 1e-6, 'u for micro'],
    ['1 nK', 1e-9, 'SI prefix nano'],
    ['25 °C', 298.15, 'T/K = t/°C + 273.15 (SI Brochure 2.3.1)'],
    ['25 degC', 298.15, 'same, typed as degC'],
    ['77 °F', 298.15, 'T/K = (t/°F + 459.67)/1.8 (NIST SP 811, B.8)'],
  ] as const)('temperature %s = %s K (%s)', (typed, kelvin, _source) => {
    expect(relative(toKelvin(typed), kelvin)).toBeLessThan(1e-13)
  })

  it.each([
    ['1 bar', 1e5, 'bar = 10⁵ Pa (SI Brochure 8th ed., Table 8)'],
    ['1 mbar', 100, 'millibar'],
    ['1 atm', 101325, 'standard atmosphere, exact (NIST SP 811, B.8)'],
    ['1 Pa', 1, 'pascal'],
    ['1 kPa', 1000, 'kilopascal'],
    ['1 Torr', 101325 / 760, 'torr = 101 325/760 Pa exactly (NIST SP 811, B.8)'],
    ['1 mmHg', 133.322387415, 'conventional mmHg = 13.5951 g/cm³ × 9.80665 m/s² × 1 mm (NIST SP 811, B.8)'],
    ['1 psi', 6894.757293168361, 'lbf/in² = 0.45359237 kg × 9.80665 m/s² / (0.0254 m)² (NIST SP 811: 6.894 757 E+03)'],
  ] as const)('pressure %s = %s Pa (%s)', (typed, pascal, _source) => {
    expect(relative(toPascal(typed), pascal)).toBeLessThan(1e-15)
  })

  it('mmHg is 133.322387415 Pa to every digit, and differs from the torr by about 1.4e-7', () => {
    expect(Math.abs(toPascal('1 mmHg') - 133.322387415)).toBeLessThan(1e-12)
    expect(relative(toPascal('1 mmHg'), toPascal('1 Torr'))).toBeGreaterThan(1e-7)
    expect(relative(toPascal('1 mmHg'), toPascal('1 Torr'))).toBeLessThan(2e-7)
  })

  it.each([
    ['9.4 T', 9.4, 'tesla'],
    ['500 mT', 0.5, 'millitesla'],
    ['5000 G', 0.5, 'gauss ≙ 10⁻⁴ T (SI Brochure 8th ed., Table 9)'],
    ['94 kG', 9.4, 'kilogauss'],
  ] as const)('field %s = %s T (%s)', (typed, tesla, _source) => {
    expect(relative(toTesla(typed), tesla)).toBeLessThan(1e-15)
  })

  it.each([
    ['28.0134 g/mol', 0.0280134, 'gram per mole'],
    ['0.0280134 kg/mol', 0.0280134, 'kilogram per mole'],
    ['28.0134 u', 28.0134 * 1.6605390666e-27 * 6.02214076e23, 'atomic mass constant m_u (CODATA 2018) × N_A'],
    ['28.0134 Da', 28.0134 * 1.6605390666e-27 * 6.02214076e23, 'dalton = u'],
  ] as const)('molar mass %s = %s kg/mol (%s)', (typed, value, _source) => {
    expect(relative(toKilogramsPerMole(typed), value)).toBeLessThan(1e-15)
  })

  it('frequencies in MHz, GHz and THz', () => {
    expect(relative(toHertz('400 MHz'), 4e8)).toBeLessThan(1e-15)
    expect(relative(toHertz('9.5 GHz'), 9.5e9)).toBeLessThan(1e-15)
    expect(relative(toHertz('1.2 THz'), 1.2e12)).toBeLessThan(1e-15)
  })

  it('hyphen and superscript exponents in compound units (kJ mol-1, s-1 T-1)', () => {
    expect(relative(toJoules('12 kJ mol-1'), toJoules('12 kJ/mol'))).toBeLessThan(1e-15)
    expect(relative(toJoules('12 kJ mol⁻¹'), toJoules('12 kJ/mol'))).toBeLessThan(1e-15)
    expect(parseQuantity('2.675e8 s-1 T-1', 'x').dimension).toBe('gyromagnetic ratio')
  })
})

describe('units shown back in the spectroscopists’ notation', () => {
  it.each([
    ['cm^-1', 'cm⁻¹'],
    ['cm-1', 'cm⁻¹'],
    ['1/cm', 'cm⁻¹'],
    ['uK', 'µK'],
    ['um', 'µm'],
    ['degC', '°C'],
    ['angstrom', 'Å'],
    ['s^-1 T^-1', 's⁻¹ T⁻¹'],
  ])('%s is shown as %s', (typed, shown) => {
    expect(spectroscopicUnit(typed)).toBe(shown)
  })
  it('an unknown unit is named in that notation', () => {
    expect(() => toJoules('5 furlongs cm-1')).toThrow(/furlongs cm⁻¹/)
  })
})

describe('molar mass: a mass read as the wrong thing (issue 16)', () => {
  it.each(['28 g', '28 kg', '28 mg'])('%s is refused with "did you mean …/mol?"', (typed) => {
    try {
      toKilogramsPerMole(typed, 'molarMass')
      expect.unreachable()
    } catch (error) {
      expect(error).toBeInstanceOf(EngineInputError)
      expect((error as EngineInputError).issues[0]!.path).toBe('molarMass')
      expect((error as EngineInputError).issues[0]!.message).toMatch(new RegExp(`did you mean '${typed}/mol'\\?`))
    }
  })
  it('the thermochemistry block names the field and computes nothing', () => {
    expect(() => evaluate({ kind: 'thermochemistry', input: { molarMass: '28 g', shape: 'atom', temperature: '298.15 K' } })).toThrow(/molarMass.*did you mean '28 g\/mol'/)
  })
  it('N2 in u, Da, g/mol and kg/mol gives one entropy', () => {
    const entropy = (molarMass: string) => evaluate({ kind: 'thermochemistry', input: { molarMass, shape: 'atom', temperature: '298.15 K' } }).result.totals.entropy
    const reference = entropy('28.0134 g/mol')
    for (const typed of ['28.0134 u', '28.0134 Da', '0.0280134 kg/mol']) expect(relative(entropy(typed), reference)).toBeLessThan(1e-9)
  })
})

describe('wavelengths as energy input', () => {
  it('are read as vacuum wavelengths and the result says so', () => {
    const evaluation = evaluate({ kind: 'levels', input: { levels: [{ energy: '0 cm-1' }, { energy: '532 nm' }], temperature: '10000 K' } })
    expect(evaluation.warnings.join(' ')).toMatch(/'532 nm' is read as vacuum wavelength: E = hc\/λ/)
  })
  it('cannot be the unit of an energy column (not proportional to energy)', () => {
    expect(() => energyFactor('nm', 'levelTable.energyUnit')).toThrow(/not proportional to energy/)
  })
})
