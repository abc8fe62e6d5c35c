import { describe, expect, it } from 'vitest'
import { dispositionParameters, multipartBoundary, parseMultipartBody } from '../../../server/utils/multipart'

/** A body as Node's fetch (undici) and browsers build it, via the platform's own FormData. */
async function encode(form: FormData) {
  const response = new Response(form)
  const type = response.headers.get('content-type')!
  return { body: Buffer.from(await response.arrayBuffer()), boundary: multipartBoundary(type)! }
}

describe('multipart reader', () => {
  it('reads fields and files encoded by the platform FormData, bytes unchanged', async () => {
    const form = new FormData()
    const bytes = new Uint8Array([0, 1, 2, 13, 10, 45, 45, 255])
    form.append('note', 'plain text')
    form.append('file', new Blob([bytes], { type: 'text/csv' }), 'Ørsted Δν.csv')
    const { body, boundary } = await encode(form)
    const parts = parseMultipartBody(body, boundary)!
    expect(parts.map(part => part.name)).toEqual(['note', 'file'])
    expect(parts[0]!.data.toString()).toBe('plain text')
    expect(parts[0]!.filename).toBeUndefined()
    expect(parts[1]!.filename).toBe('Ørsted Δν.csv')
    expect(parts[1]!.type).toBe('text/csv')
    expect(Buffer.compare(parts[1]!.data, Buffer.from(bytes))).toBe(0)
  })

  it('keeps ; and = inside a quoted file name and reads the RFC 5987 form', () => {
    expect(dispositionParameters('form-data; name="file"; filename="a;b=c.csv"')).toEqual({ name: 'file', filename: 'a;b=c.csv' })
    // A backslash is part of the name (Windows paths), not an escape.
    expect(dispositionParameters('form-data; name="file"; filename="..\\x.csv"').filename).toBe('..\\x.csv')
    const body = Buffer.from('--XY\r\nContent-Disposition: form-data; name="file"; filename="fallback.csv"; filename*=UTF-8\'\'%C3%A9t%C3%A9.csv\r\n\r\nE\r\n--XY--\r\n')
    const parts = parseMultipartBody(body, 'XY')!
    expect(parts[0]!.filename).toBe('été.csv')
    expect(parts[0]!.data.toString()).toBe('E')
  })

  it('answers undefined for a body without a closing boundary', () => {
    expect(parseMultipartBody(Buffer.from('--XY\r\nContent-Disposition: form-data; name="file"\r\n\r\nE'), 'XY')).toBeUndefined()
    expect(parseMultipartBody(Buffer.from('no boundary here'), 'XY')).toBeUndefined()
  })

  it('reads the boundary from quoted and plain Content-Type values', () => {
    expect(multipartBoundary('multipart/form-data; boundary=----abc')).toBe('----abc')
    expect(multipartBoundary('multipart/form-data; boundary="a b"')).toBe('a b')
    expect(multipartBoundary('multipart/form-data')).toBeUndefined()
  })
})
