import { inflateSync } from 'node:zlib'
import { BundleExtractionError, readBundleBytes } from '#shared/pdf/extractBundle'

/** Upload bytes → {source, bundle}; 400 for neither PDF nor JSON, 422 for a PDF without a readable bundle. */
export function bundleFromUpload(bytes: Uint8Array): { source: 'pdf' | 'json', bundle: unknown } {
  try {
    return readBundleBytes(bytes, data => inflateSync(data, { maxOutputLength: 64 * 1024 * 1024 }))
  }
  catch (error) {
    if (error instanceof BundleExtractionError)
      throw createError({ statusCode: error.problem === 'not_pdf' ? 400 : 422, message: error.message, data: { problem: error.problem } })
    throw error
  }
}
