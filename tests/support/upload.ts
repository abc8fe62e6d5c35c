import { baseURL, type Client, type Reply } from './http'

/** Posts one file as multipart/form-data (field `file`) with the client's session. */
export async function uploadFile(client: Client, path: string, name: string, bytes: Uint8Array | string, type = 'application/octet-stream', field = 'file'): Promise<Reply> {
  const form = new FormData()
  const data = typeof bytes === 'string' ? new TextEncoder().encode(bytes) : bytes
  form.append(field, new Blob([data as Uint8Array<ArrayBuffer>], { type }), name)
  return sendRaw(client, 'POST', path, form)
}

/** Any body (FormData, bytes, a stream) with the client's cookie and address. */
export async function sendRaw(client: Client, method: string, path: string, body: BodyInit | undefined, headers: Record<string, string> = {}): Promise<Reply> {
  const init: RequestInit & { duplex?: 'half' } = {
    method,
    body,
    headers: { 'x-forwarded-for': client.address, ...(client.cookie ? { cookie: client.cookie } : {}), ...headers },
    redirect: 'manual',
  }
  if (body instanceof ReadableStream)
    init.duplex = 'half'
  const response = await fetch(`${baseURL()}${path}`, init)
  const buffer = Buffer.from(await response.arrayBuffer())
  let parsed: unknown = buffer
  if ((response.headers.get('content-type') ?? '').includes('json')) {
    try { parsed = JSON.parse(buffer.toString('utf8')) } catch { /* keep bytes */ }
  }
  return { status: response.status, body: parsed, headers: response.headers }
}
