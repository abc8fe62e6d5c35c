/** Field schemas several kinds share. */
import { z } from 'zod'
import { toJoules, toKelvin } from '../units'
import { quantityField } from '../schema'

/** An absolute temperature text, converted to K. */
export const temperatureField = quantityField("298.15 K' or '25 °C", (text) => toKelvin(text, ''))

/** An energy text kept as typed together with its value in J per particle. */
export interface EnergyValue {
  /** The text as typed, e.g. "2143.3 cm⁻¹". */
  text: string
  /** Energy per particle in J. */
  joules: number
}

/** An energy given as energy, molar energy, wavenumber, frequency or temperature equivalent. */
export const energyField = quantityField("2143.3 cm⁻¹', '0.36 eV', '12 kJ/mol', '300 K' or a vacuum wavelength '532 nm", (text): EnergyValue => ({
  text,
  joules: toJoules(text, ''),
}))

/** A positive energy (wavenumbers, rotational constants). */
export const positiveEnergyField = energyField.refine((value) => value.joules > 0, { error: 'expected a value above zero' })

/** Result units, attached to results so nobody has to guess them. */
export const MOLAR_UNITS = {
  energy: 'J/mol',
  entropy: 'J/(mol K)',
  heatCapacity: 'J/(mol K)',
  temperature: 'K',
  particleEnergy: 'J',
} as const

export type Infer<T extends z.ZodType> = z.output<T>
