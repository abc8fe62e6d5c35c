
/**
 * Request body size limits. Neither Nitro nor h3 limits a body: readBody buffers whatever
 * arrives. This middleware refuses, with 413, a declared Content-Length over the route's limit
 * before reading anything, and reads other bodies itself with a running count (a chunked body
 * without Content-Length is cut off as soon as it passes the limit); the bytes read are handed
 * on to readBody/readRawBody through event._requestBody.
 *
 * JSON bodies are also checked for nesting depth and for text PostgreSQL cannot store
 * (server/utils/jsonBodyChecks.ts).
 *
 * Limits (bytes): JSON and other bodies 1 MB (THERMOTOME_BODY_LIMIT); the data-file upload
 * 21 MB (20 MB file + multipart framing; that route counts streamed bytes itself, so it is
 * only checked by its declared length here); the record check upload (/api/verify) likewise.
 * A route that reads the raw request stream itself must be listed with `false` here: once
 * this middleware has read a body, the stream is spent (readAttachmentRequestBody also takes
 * a body already read from event._requestBody).
 */
const MB = 1024 * 1024

function jsonLimit() {
  const configured = Number(process.env.THERMOTOME_BODY_LIMIT)
  return Number.isFinite(configured) && configured > 0 ? configured : 1 * MB
}

/** [path pattern, limit, read here?] — the first match wins. */
const LIMITS: Array<[RegExp, () => number, boolean]> = [
  [/^\/api\/entries\/[^/]+\/attachments\/?$/, () => 21 * MB, false],
  // /api/verify reads its body with readAttachmentRequestBody, which counts streamed bytes.
  [/^\/api\/verify\/?$/, () => 21 * MB, false],
]

function tooLarge(limit: number): never {
  throw createError({
    statusCode: 413,
    statusMessage: 'Payload Too Large',
    message: `The request body is larger than the ${Math.round(limit / MB)} MB this route accepts.`,
  })
}

export default defineEventHandler(async (event) => {
  const method = event.method
  if (method === 'GET' || method === 'HEAD' || method === 'OPTIONS')
    return
  const path = event.path.split('?')[0]!
  if (!path.startsWith('/api/'))
    return
  const [, limitOf, readHere] = LIMITS.find(([pattern]) => pattern.test(path)) ?? [null, jsonLimit, true]
  const limit = limitOf()

  const declaredHeader = getRequestHeader(event, 'content-length')
  const declared = declaredHeader === undefined ? Number.NaN : Number(declaredHeader)
  if (Number.isFinite(declared) && declared > limit)
    tooLarge(limit)
  const chunked = /\bchunked\b/i.test(getRequestHeader(event, 'transfer-encoding') ?? '')
  if (!readHere || !(chunked || declared > 0))
    return
  const body = await readRequestCapped(event, limit)
  if (!body)
    tooLarge(limit)
  // h3 reads a Buffer here as the raw body; Buffer.concat gives one backed by a plain ArrayBuffer.
  event._requestBody = body as Buffer<ArrayBuffer>
  // JSON bodies: refuse nesting and text that would overflow a stack or that PostgreSQL
  // cannot store, as a 400 naming the field, before any route sees them.
  if (/json/i.test(getRequestHeader(event, 'content-type') ?? '') && body.length > 0) {
    const problem = jsonBodyProblem(body.toString('utf8'))
    if (problem)
      validationError([problem], 'body')
  }
})
