/**
 * The demo lab: a fictional group of our own (Kestrel Ridge Molecular Physics Laboratory).
 * Every name, address and number here is invented for demonstration only.
 */
export const DEMO_PASSWORD = 'kestrel-ridge-demo'

export const DEMO_PEOPLE = [
  { key: 'amara', email: 'amara.lindqvist@kestrel-ridge.example', name: 'Dr Amara Lindqvist', roles: ['scientist'] },
  { key: 'jonah', email: 'jonah.whitfield@kestrel-ridge.example', name: 'Dr Jonah Whitfield', roles: ['scientist', 'witness'] },
  { key: 'priya', email: 'priya.natarajan@kestrel-ridge.example', name: 'Priya Natarajan', roles: ['witness'] },
  { key: 'felix', email: 'felix.oyelaran@kestrel-ridge.example', name: 'Felix Oyelaran', roles: ['compliance'] },
  { key: 'hana', email: 'hana.sorensen@kestrel-ridge.example', name: 'Hana Sørensen', roles: ['admin'] },
] as const

type Node = Record<string, unknown>
const paragraph = (text: string): Node => ({ type: 'paragraph', content: [{ type: 'text', text }] })
const heading = (text: string): Node => ({ type: 'heading', attrs: { level: 2 }, content: [{ type: 'text', text }] })
const doc = (...content: Node[]) => ({ type: 'doc', content })
/** A calculation block with a fixed id (the demo must seed the same way every time). */
const block = (serial: number, kind: string, title: string, input: Record<string, unknown>): Node => ({
  type: 'calculationBlock',
  attrs: { blockId: `6b1d0c2e-0000-4000-8000-${String(serial).padStart(12, '0')}`, kind, title, input, collapsed: false },
})

export const DEMO_NOTEBOOKS = [
  {
    name: 'Infrared line surveys — cell B',
    description: 'Gas-cell absorption surveys on the long-path bench: band populations and line-intensity temperatures.',
    members: ['amara', 'jonah', 'priya'],
    entries: [
      {
        author: 'amara', title: 'Cell B baseline run, week 14',
        content: doc(
          heading('Purpose'),
          paragraph('Baseline absorption survey of the reference gas mixture after the cell window replacement.'),
          heading('Conditions'),
          paragraph('Cell held at 296 K by the recirculating bath; pressure 20.0 mbar, path 12.4 m. Spectra averaged over 64 scans.'),
          heading('Ground-band populations'),
          paragraph('Vibrational ladder of the reference gas (invented, CO-like constants) at the bath temperature: the v = 1 share decides whether hot bands show up in the survey.'),
          block(1, 'vibration', 'Vibrational ladder at 296 K', {
            modes: [{ label: 'stretch (invented CO-like values)', wavenumber: '2169.8 cm^-1', anharmonicity: '13.3 cm^-1' }],
            temperature: '296 K',
            energyZero: 'groundState',
          }),
        ),
      },
      {
        author: 'amara', title: 'Rotational temperature from the R-branch, run 7',
        content: doc(
          paragraph('Line intensities of the R-branch taken from the fitted spectrum; temperature to be derived with a Boltzmann plot once the line table is checked.'),
          block(2, 'boltzmannPlot', 'R-branch Boltzmann plot, run 7', {
            lines: [
              { label: 'R(4)', upperEnergy: '38.6 cm^-1', degeneracy: 11, intensity: 0.912, uncertainty: 0.02 },
              { label: 'R(8)', upperEnergy: '138.4 cm^-1', degeneracy: 19, intensity: 0.934, uncertainty: 0.02 },
              { label: 'R(12)', upperEnergy: '298.0 cm^-1', degeneracy: 27, intensity: 0.612, uncertainty: 0.015 },
              { label: 'R(16)', upperEnergy: '516.9 cm^-1', degeneracy: 35, intensity: 0.261, uncertainty: 0.01 },
              { label: 'R(20)', upperEnergy: '794.7 cm^-1', degeneracy: 43, intensity: 0.0688, uncertainty: 0.004 },
            ],
          }),
          paragraph('Intensities above are invented demonstration values, not measurements.'),
        ),
      },
      {
        author: 'jonah', title: 'Hot-band fraction check before heated-cell series',
        content: doc(
          paragraph('Estimate of the first excited vibrational level population at the planned cell temperatures, to decide whether hot bands need fitting.'),
          block(3, 'levels', 'Lowest levels at 600 K', {
            levels: [
              { label: 'v = 0', energy: '0 cm^-1', degeneracy: 1 },
              { label: 'v = 1', energy: '2143.3 cm^-1', degeneracy: 1 },
              { label: 'v = 2', energy: '4260.1 cm^-1', degeneracy: 1 },
            ],
            temperature: '600 K',
          }),
        ),
      },
    ],
  },
  {
    name: 'Hyperpolarisation bench',
    description: 'Thermal polarisation references for the low-field and high-field NMR set-ups.',
    members: ['jonah', 'priya'],
    entries: [
      {
        author: 'jonah', title: 'Thermal reference polarisation at 9.4 T',
        content: doc(
          paragraph('Reference thermal polarisation for the enhancement factors quoted in the March series.'),
          block(4, 'spin', 'Proton polarisation at 9.4 T, 298 K', { nucleus: '1H', field: '9.4 T', temperature: '298.15 K' }),
        ),
      },
    ],
  },
  {
    name: 'Flame thermometry',
    description: 'Emission and absorption thermometry in the laminar burner rig.',
    members: ['amara', 'priya'],
    entries: [
      {
        author: 'amara', title: 'Burner rig commissioning notes',
        content: doc(paragraph('Flow controllers calibrated; the burner is lit and stable at the design equivalence ratio.')),
      },
    ],
  },
] as const
