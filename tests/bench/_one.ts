import { registry } from '../../shared/thermo/index'
import { boltzmannStatistics } from '../../shared/thermo/numerics'
const million = 1_000_000
const e = Array.from({ length: million }, (_, i) => i * 0.05)
const def = registry.levels!
for (let r = 0; r < 4; r++) {
  let t = performance.now(); const p = def.schema.safeParse({ levelTable: { energyUnit: 'cm^-1', energies: e }, temperature: '298.15 K' }); const t1 = performance.now() - t
  t = performance.now(); const res = def.compute(p.data, []); const t2 = performance.now() - t
  t = performance.now(); const f = new Array<number>(million); const l = new Array<number>(million); boltzmannStatistics(e, null, 298.15, f, l, 1.98e-23); const t3 = performance.now() - t
  t = performance.now(); const f2 = new Float64Array(million); const l2 = new Float64Array(million); boltzmannStatistics(e, null, 298.15, f2, l2, 1.98e-23); const t4 = performance.now() - t
  console.log({ parse: t1.toFixed(1), compute: t2.toFixed(1), statsArray: t3.toFixed(1), statsTyped: t4.toFixed(1) })
}
