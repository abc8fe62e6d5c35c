import { inject } from 'vitest'
import { DEMO_PASSWORD, DEMO_PEOPLE } from '../../shared/demo'
import { rememberCookies } from './cookies'

export const baseURL = () => inject('baseURL')

export type DemoKey = (typeof DEMO_PEOPLE)[number]['key']
export const demoPerson = (key: DemoKey) => DEMO_PEOPLE.find(p => p.key === key)!

export interface Reply<T = any> { status: number, body: T, headers: Headers }

/** A tiny cookie-keeping client: one instance is one browser's worth of session. */
export class Client {
  cookie = ''
  address: string

  constructor(address = '203.0.113.10') {
    // Each client claims its own forwarded address so throttling tests stay independent.
    this.address = address
  }

  async request<T = any>(method: string, path: string, body?: unknown, extraHeaders: Record<string, string> = {}): Promise<Reply<T>> {
    const headers: Record<string, string> = { 'x-forwarded-for': this.address, ...extraHeaders }
    if (this.cookie) headers.cookie = this.cookie
    let payload: string | undefined
    if (body !== undefined) {
      headers['content-type'] ??= 'application/json'
      payload = typeof body === 'string' ? body : JSON.stringify(body)
    }
    const response = await fetch(`${baseURL()}${path}`, { method, headers, body: payload, redirect: 'manual' })
    this.cookie = rememberCookies(this.cookie, response.headers.getSetCookie())
    const text = await response.text()
    let parsed: unknown = text
    try { parsed = JSON.parse(text) } catch { /* not JSON */ }
    return { status: response.status, body: parsed as T, headers: response.headers }
  }

  get<T = any>(path: string) { return this.request<T>('GET', path) }
  post<T = any>(path: string, body?: unknown) { return this.request<T>('POST', path, body ?? {}) }
  patch<T = any>(path: string, body?: unknown) { return this.request<T>('PATCH', path, body ?? {}) }
  put<T = any>(path: string, body?: unknown) { return this.request<T>('PUT', path, body ?? {}) }

  async signIn(email: string, password = DEMO_PASSWORD) {
    const reply = await this.post('/api/auth/login', { email, password })
    if (reply.status !== 200)
      throw new Error(`sign-in of ${email} failed: ${reply.status} ${JSON.stringify(reply.body)}`)
    return reply
  }
}

let addressCounter = 20
/** A signed-in client for one demo person, from a distinct client address. */
export async function as(key: DemoKey) {
  const client = new Client(`198.51.100.${addressCounter++ % 250}`)
  await client.signIn(demoPerson(key).email)
  return client
}
