/**
 * Physical constants in SI units.
 *
 * The five defining constants below are exact by definition of the SI since 20 May 2019
 * (BIPM, The International System of Units, 9th edition, 2019, Table 1; the same values are
 * listed as exact in CODATA 2018, Tiesinga et al., Rev. Mod. Phys. 93, 025010 (2021)).
 */

/** Planck constant h in J s (exact, SI 2019). */
export const PLANCK_CONSTANT = 6.62607015e-34

/** Speed of light in vacuum c in m s^-1 (exact, SI 2019). */
export const SPEED_OF_LIGHT = 299792458

/** Boltzmann constant k in J K^-1 (exact, SI 2019). */
export const BOLTZMANN_CONSTANT = 1.380649e-23

/** Avogadro constant N_A in mol^-1 (exact, SI 2019). */
export const AVOGADRO_CONSTANT = 6.02214076e23

/** Elementary charge e in C (exact, SI 2019); also the joules in one electronvolt. */
export const ELEMENTARY_CHARGE = 1.602176634e-19

/** Reduced Planck constant ħ = h / 2π in J s (exact by derivation). */
export const REDUCED_PLANCK_CONSTANT = PLANCK_CONSTANT / (2 * Math.PI)

/** Molar gas constant R = N_A k in J mol^-1 K^-1 (exact by derivation; CODATA 2018: 8.314 462 618... ). */
export const GAS_CONSTANT = AVOGADRO_CONSTANT * BOLTZMANN_CONSTANT

/**
 * Second radiation constant c2 = h c / k in m K (exact by derivation;
 * CODATA 2018: 1.438 776 877... × 10^-2 m K).
 */
export const SECOND_RADIATION_CONSTANT = (PLANCK_CONSTANT * SPEED_OF_LIGHT) / BOLTZMANN_CONSTANT

/** Atomic mass constant m_u in kg (CODATA 2018, measured: 1.660 539 066 60(50) × 10^-27 kg). */
export const ATOMIC_MASS_CONSTANT = 1.6605390666e-27

/** Standard-state pressure p° = 1 bar = 10^5 Pa (IUPAC recommendation since 1982). */
export const STANDARD_PRESSURE = 1e5

/** Hartree energy E_h in J (CODATA 2018, measured: 4.359 744 722 2071(85) × 10^-18 J). */
export const HARTREE_ENERGY = 4.3597447222071e-18

/** Standard atmosphere in Pa (exact by definition, 10th CGPM 1954; SI Brochure, 9th ed., Table 8 note). */
export const STANDARD_ATMOSPHERE = 101325

/**
 * Conventional millimetre of mercury in Pa: 13.5951 g/cm³ × 9.80665 m/s² × 1 mm = 133.322 387 415
 * Pa exactly (conventional density of mercury and standard gravity; NIST SP 811 (2008), B.8).
 */
export const MILLIMETRE_OF_MERCURY = 133.322387415

/** Pound-force per square inch in Pa: 0.453 592 37 kg × 9.806 65 m/s² / (0.0254 m)² (exact; NIST SP 811, B.8). */
export const POUND_FORCE_PER_SQUARE_INCH = (0.45359237 * 9.80665) / (0.0254 * 0.0254)

/** Thermochemical calorie in J (exact by definition, 4.184 J; NIST SP 811). */
export const THERMOCHEMICAL_CALORIE = 4.184

/** ln(10), used to turn natural logarithms of populations into log10. */
export const LN10 = Math.LN10
