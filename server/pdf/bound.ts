// A record PDF bound to its bundle (DESIGN.md "Trust anchors"): the PDF is a pure function of
// the bundle (record, signatures, keys, and the export context: state, audit events with their
// proofs, checkpoint), rendered deterministically, so a verifier renders it again from the
// embedded bundle and compares bytes. Any edit to the visible text, a second attachment, or
// anything else added or changed, makes the bytes differ. Pure: no Nitro.
import { verifyBundle, type RecordBundle } from '../../shared/records'
import { renderRecordPdfBytes } from './render'

/** The record PDF of a bundle that carries its export context (fonts must be set up). */
export async function renderBoundPdf(bundle: RecordBundle): Promise<Buffer> {
  if (!bundle.context) throw new Error('a record PDF is rendered from a bundle with its export context (state, audit events, checkpoint)')
  // The check printed in the PDF is the bundle's own, so anyone re-rendering gets the same words.
  const verification = await verifyBundle(bundle)
  return await renderRecordPdfBytes({ bundle, state: bundle.context.state, auditEvents: bundle.context.auditEvents, verification })
}

/**
 * Is `pdf` exactly the PDF its bundle renders to? Null when it is, else the problem in words.
 * `bundle` is what was extracted from it (already checked by verifyBundle).
 */
export async function pdfBindingProblem(pdf: Uint8Array, bundle: RecordBundle): Promise<string | null> {
  if (!bundle.context)
    return 'this PDF\'s bundle carries no export context (state and audit events), so its visible text cannot be checked against the bundle; export the record again'
  const expected = await renderBoundPdf(bundle)
  if (expected.length === pdf.length && expected.equals(Buffer.from(pdf.buffer, pdf.byteOffset, pdf.byteLength))) return null
  let at = 0
  while (at < expected.length && at < pdf.length && expected[at] === pdf[at]) at++
  return `the PDF is not the one its bundle renders to (${pdf.length} bytes, expected ${expected.length}; they differ from byte ${at}): its visible text or pages were changed, or something was added, after export`
}
