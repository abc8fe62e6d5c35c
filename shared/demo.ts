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
        ),
      },
      {
        author: 'amara', title: 'Rotational temperature from the R-branch, run 7',
        content: doc(
          paragraph('Line intensities of the R-branch taken from the fitted spectrum; temperature to be derived with a Boltzmann plot once the line table is checked.'),
        ),
      },
      {
        author: 'jonah', title: 'Hot-band fraction check before heated-cell series',
        content: doc(
          paragraph('Estimate of the first excited vibrational level population at the planned cell temperatures, to decide whether hot bands need fitting.'),
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
        content: doc(paragraph('Reference thermal polarisation for the enhancement factors quoted in the March series.')),
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
