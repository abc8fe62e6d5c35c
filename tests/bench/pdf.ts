/**
 * PDF benchmarks (run with `npx tsx tests/bench/pdf.ts`; not part of the test run).
 * 1. Render time of a three-page record (target: under 300 ms), median and p95 after warm-up.
 * 2. A bulk export of 500 records through the same pipeline the export job runs — render each
 *    PDF, canonical bundle JSON, SHA-256 of both, then a zip streamed by archiver with a
 *    manifest — timed, with peak resident memory (target: under 60 s and 500 MB). The
 *    database reads are left out: records are built in memory by the test fixture.
 */
import { createHash } from 'node:crypto'
import { createWriteStream, mkdtempSync, rmSync, statSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { ZipArchive } from 'archiver'
import { canonicalJson, verifyBundle } from '../../shared/records'
import { renderRecordPdfBytes, setupPdfFonts } from '../../server/pdf/render'
import { pdfFontFilesFromNodeModules, pdfFontLoaderFromNodeModules } from '../support/pdfFonts'
import { fixtureKey, signedBundle } from '../support/signedRecords'

setupPdfFonts(pdfFontFilesFromNodeModules(), pdfFontLoaderFromNodeModules)
const author = { id: 'a1', name: 'Dr Amara Lindqvist', email: 'amara.lindqvist@kestrel-ridge.example' }
const witness = { id: 'w1', name: 'Priya Natarajan', email: 'priya.natarajan@kestrel-ridge.example' }
const authorKey = await fixtureKey()
const witnessKey = await fixtureKey()
const notebook = { id: 'n1', name: 'Infrared line surveys — cell B' }
const pages = (pdf: Buffer) => (pdf.toString('latin1').match(/\/Type \/Page\b/g) ?? []).length
const percentile = (values: number[], p: number) => [...values].sort((a, b) => a - b)[Math.min(values.length - 1, Math.floor(values.length * p))]!

let peakRss = process.memoryUsage().rss
const sampler = setInterval(() => { peakRss = Math.max(peakRss, process.memoryUsage().rss) }, 50)

// 1. A three-page record: signatures and hash on page one, the entry with a levels block (eight levels) after.
const threePage = await signedBundle({
  notebook, title: 'Three-page record for the benchmark', author, authorKey, witness, witnessKey,
  blocks: [
    { kind: 'levels', title: 'Eight levels', input: { levels: Array.from({ length: 8 }, (_, v) => ({ label: `v = ${v}`, energy: `${(2143.3 * v).toFixed(1)} cm^-1` })), temperature: '1500 K' } },
  ],
})
const input = { bundle: threePage.bundle, state: 'witnessed' as const, auditEvents: [], verification: await verifyBundle(threePage.bundle) }
const first = await renderRecordPdfBytes(input)
console.log(`three-page record: ${pages(first)} pages, ${first.length} bytes`)
for (let warm = 0; warm < 5; warm++) await renderRecordPdfBytes(input)
const times: number[] = []
const cpuBefore = process.cpuUsage()
for (let run = 0; run < 20; run++) {
  const start = performance.now()
  await renderRecordPdfBytes(input)
  times.push(performance.now() - start)
}
const cpu = process.cpuUsage(cpuBefore)
// CPU time per render is what an idle core would take; wall time also counts other processes on a busy machine.
console.log(`  render: median ${percentile(times, 0.5).toFixed(0)} ms, p95 ${percentile(times, 0.95).toFixed(0)} ms wall; ${((cpu.user + cpu.system) / 1000 / 20).toFixed(0)} ms CPU per render (target < 300 ms); load average ${(await import('node:os')).loadavg()[0]!.toFixed(1)} on ${(await import('node:os')).cpus().length} cores`)

// 2. Bulk export of 500 records.
const folder = mkdtempSync(join(tmpdir(), 'thermotome-bench-'))
const count = Number(process.env.BENCH_RECORDS ?? 500)
const started = performance.now()
const bulkCpuBefore = process.cpuUsage()
const archive = new ZipArchive({ zlib: { level: 6 } })
const output = createWriteStream(join(folder, 'export.zip'))
const closed = new Promise(resolve => output.on('close', resolve))
archive.pipe(output)
const manifest: { path: string, sha256: string, bytes: number }[] = []
for (let index = 0; index < count; index++) {
  const made = await signedBundle({
    notebook, title: `Bulk record ${index}`, author, authorKey, witness, witnessKey,
    blocks: [{ kind: 'levels', title: 'Two levels', input: { levels: [{ energy: '0 cm^-1' }, { energy: `${100 + index} cm^-1`, degeneracy: 3 }], temperature: '300 K' } }],
  })
  const pdf = await renderRecordPdfBytes({ bundle: made.bundle, state: 'witnessed', auditEvents: [], verification: await verifyBundle(made.bundle) })
  const json = Buffer.from(canonicalJson(made.bundle as never), 'utf8')
  for (const [path, data] of [[`records/${made.entryId}-v1.pdf`, pdf], [`records/${made.entryId}-v1.json`, json]] as const) {
    manifest.push({ path, sha256: createHash('sha256').update(data).digest('hex'), bytes: data.length })
    archive.append(data, { name: path, store: path.endsWith('.pdf') })
  }
  // Let the archive drain, as the job does by storing files as it goes.
  if (index % 10 === 9) await new Promise(resolve => setImmediate(resolve))
}
archive.append(JSON.stringify({ files: manifest }, null, 2), { name: 'manifest.json' })
await archive.finalize()
await closed
const seconds = (performance.now() - started) / 1000
const bulkCpu = process.cpuUsage(bulkCpuBefore)
clearInterval(sampler)
console.log(`bulk export of ${count} records: ${seconds.toFixed(1)} s wall, ${((bulkCpu.user + bulkCpu.system) / 1e6).toFixed(1)} s CPU (target < 60 s), zip ${(statSync(join(folder, 'export.zip')).size / 1e6).toFixed(1)} MB, peak RSS ${(peakRss / 1e6).toFixed(0)} MB (target < 500 MB)`)
rmSync(folder, { recursive: true, force: true })
