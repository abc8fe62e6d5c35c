"""Reference values from ASE's ideal-gas thermochemistry (ase.thermochemistry.IdealGasThermo)
for the comparison suite tests/unit/thermo/ase.test.ts. Reads a JSON list of molecules on stdin,
writes a JSON list of results on stdout. ASE's constants are switched to CODATA 2018, the set
the engine uses, so differences are the models' and the arithmetic's, not the constants'."""
import contextlib
import io
import json
import sys

import ase.units
from ase import Atoms
from ase.thermochemistry import IdealGasThermo

ase.units.__dict__.update(ase.units.create_units('2018'))


def reference(molecule):
    atoms = Atoms(positions=molecule['positions'], masses=molecule['masses'])
    atoms.set_masses(molecule['masses'])
    energies = molecule['vibrationEnergies']
    temperature, pressure = molecule['temperature'], molecule['pressure']
    full = IdealGasThermo(energies, molecule['geometry'], atoms=atoms, symmetrynumber=molecule['sigma'], spin=molecule['spin'])
    bare = IdealGasThermo([], 'monatomic', atoms=atoms, symmetrynumber=molecule['sigma'], spin=molecule['spin'])
    with contextlib.redirect_stdout(io.StringIO()):
        entropy = full.get_entropy(temperature, pressure, verbose=False)
        enthalpy = full.get_enthalpy(temperature, verbose=False)
        translationalElectronic = bare.get_entropy(temperature, pressure, verbose=False)
    vibrationalEntropy = full._vibrational_entropy_contribution(temperature)
    vibrationalEnergy = full._vibrational_energy_contribution(temperature)
    return {
        'inertias': [float(value) for value in atoms.get_moments_of_inertia()],
        'entropy': float(entropy),
        'enthalpy': float(enthalpy),
        'translationalElectronicEntropy': float(translationalElectronic),
        'vibrationalEntropy': float(vibrationalEntropy),
        'vibrationalEnergy': float(vibrationalEnergy),
        'zeroPointEnergy': float(full.get_ZPE_correction()),
        'rotationalEntropy': float(entropy - translationalElectronic - vibrationalEntropy),
        'units': {'kB': ase.units.kB, 'amu': ase.units._amu},
    }


json.dump([reference(molecule) for molecule in json.load(sys.stdin)], sys.stdout)
