import type { H3Event } from 'h3'

/**
 * Read the raw request body with a running count; undefined when it passes `limit` bytes
 * (the rest drains into nothing so that a 413 still reaches the client). Chunked bodies
 * without a Content-Length are cut off as soon as they pass the limit.
 */
export function readRequestCapped(event: H3Event, limit: number): Promise<Buffer | undefined> {
  const request = event.node.req
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = []
    let total = 0
    const stop = () => {
      request.off('data', onData)
      request.off('end', onEnd)
      request.off('error', onError)
    }
    function onData(chunk: Buffer) {
      total += chunk.length
      if (total > limit) {
        stop()
        request.resume()
        resolve(undefined)
        return
      }
      chunks.push(chunk)
    }
    function onEnd() { stop(); resolve(Buffer.concat(chunks)) }
    function onError(error: Error) { stop(); reject(error) }
    request.on('data', onData).on('end', onEnd).on('error', onError)
  })
}
