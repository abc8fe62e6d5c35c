import { DEMO_PASSWORD, DEMO_PEOPLE } from '../../shared/demo'
import { rememberCookies } from '../../tests/support/cookies'

export type DemoKey = (typeof DEMO_PEOPLE)[number]['key']
export const demoEmail = (key: DemoKey) => DEMO_PEOPLE.find(p => p.key === key)!.email

export interface Reply<T = any> { status: number, body: T, text: string, headers: Headers }

let addressCounter = 1
/** A distinct documentation-range client address per client, so throttles never mix. */
export function nextAddress() {
  const n = addressCounter++
  return `198.18.${(n >> 8) & 255}.${n & 255}`
}

/** A cookie-keeping client (one browser's worth of session) or a bearer-token client. */
export class Client {
  cookie = ''
  bearer = ''
  constructor(public baseURL: string, public address = nextAddress()) {}

  async request<T = any>(method: string, path: string, body?: unknown, extraHeaders: Record<string, string> = {}, timeoutMs = 30_000): Promise<Reply<T>> {
    const headers: Record<string, string> = { 'x-forwarded-for': this.address }
    if (this.cookie) headers.cookie = this.cookie
    if (this.bearer) headers.authorization = `Bearer ${this.bearer}`
    let payload: string | Buffer | undefined
    if (body !== undefined) {
      headers['content-type'] = 'application/json'
      payload = typeof body === 'string' || Buffer.isBuffer(body) ? body : JSON.stringify(body)
    }
    Object.assign(headers, extraHeaders)
    const response = await fetch(`${this.baseURL}${path}`, { method, headers, body: payload as string | Uint8Array<ArrayBuffer> | undefined, redirect: 'manual', signal: AbortSignal.timeout(timeoutMs) })
    this.cookie = rememberCookies(this.cookie, response.headers.getSetCookie())
    const text = await response.text()
    let parsed: unknown = text
    try { parsed = JSON.parse(text) } catch { /* not JSON */ }
    return { status: response.status, body: parsed as T, text, headers: response.headers }
  }

  get<T = any>(path: string) { return this.request<T>('GET', path) }
  post<T = any>(path: string, body: unknown = {}) { return this.request<T>('POST', path, body) }

  async signIn(key: DemoKey) {
    const reply = await this.post('/api/auth/login', { email: demoEmail(key), password: DEMO_PASSWORD })
    if (reply.status !== 200)
      throw new Error(`sign-in of ${key} failed: ${reply.status} ${reply.text.slice(0, 200)}`)
    return this
  }
}

export const signedIn = (baseURL: string, key: DemoKey) => new Client(baseURL).signIn(key)
