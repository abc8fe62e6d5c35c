/**
 * Checks a Thermotome record bundle or an exported record PDF without any database:
 *   npm run verify -- FILE
 * Prints the record hash and, per signature, who signed, when (UTC), with what meaning and
 * whether the signature holds; then every problem found. Exit code 0 when everything holds,
 * 1 when the verification failed, 2 when the file cannot be read as a bundle or PDF.
 */
import { readFileSync } from 'node:fs'
import { inflateSync } from 'node:zlib'
import { formatFingerprint, verifyBundle } from '../shared/records'
import { BundleExtractionError, readBundleBytes } from '../shared/pdf/extractBundle'
import { ed25519Verify } from '../server/utils/ed25519'

async function main(): Promise<number> {
  const file = process.argv.slice(2).find(argument => argument !== '--')
  if (!file) {
    console.error('usage: npm run verify -- FILE (a record bundle .json or a record PDF)')
    return 2
  }
  let bytes: Uint8Array
  try {
    bytes = readFileSync(file)
  }
  catch (error) {
    console.error(`cannot read ${file}: ${(error as Error).message}`)
    return 2
  }
  let read: ReturnType<typeof readBundleBytes>
  try {
    read = readBundleBytes(bytes, data => inflateSync(data))
  }
  catch (error) {
    console.error(error instanceof BundleExtractionError ? error.message : `cannot read ${file}: ${String(error)}`)
    return 2
  }
  const report = await verifyBundle(read.bundle, { verifyEd25519: ed25519Verify })
  const record = (read.bundle as { record?: { entry?: { id?: string, version?: number, title?: string } } }).record?.entry
  console.log(`File: ${file} (${read.source === 'pdf' ? 'PDF with an embedded bundle' : 'bundle JSON'})`)
  if (record) console.log(`Record: ${record.title ?? ''} — entry ${record.id ?? '?'}, version ${record.version ?? '?'}`)
  console.log(`Record hash: ${report.recordHash.computed ?? 'not computable'} (${report.recordHash.ok ? 'matches the bundle' : `bundle states ${report.recordHash.stated ?? 'none'}`})`)
  for (const check of report.signatures) {
    console.log(`Signature ${check.index + 1}: ${check.ok ? 'VALID' : 'NOT VALID'}`)
    console.log(`  signed by ${check.signer.name} <${check.signer.email}>`)
    console.log(`  at ${check.signedAt.replace('T', ' ').replace(/\.\d+Z$|Z$/, '')} UTC, meaning: ${check.meaning}`)
    console.log(`  key ${formatFingerprint(check.keyFingerprint)}`)
  }
  if (report.calculations)
    console.log(`Calculations: ${report.calculations.blockCount} recomputed here; ${report.calculations.blocks.length === 0 ? 'all agree within the record tolerance' : `${report.calculations.blocks.length} differ`}`)
  for (const note of report.notes) console.log(`  note: ${note}`)
  if (report.ok) {
    console.log(`Result: VERIFIED — ${report.signatures.length} signature(s) valid and covering this record.`)
    return 0
  }
  console.log('Result: FAILED')
  for (const problem of report.problems) console.log(`  - ${problem}`)
  return 1
}

main().then(code => process.exit(code), (error) => {
  console.error(`verification could not run: ${error instanceof Error ? error.message : String(error)}`)
  process.exit(2)
})
