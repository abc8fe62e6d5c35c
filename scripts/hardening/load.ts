/** Load runs with autocannon against the production server on loopback. */
import autocannon from 'autocannon'
import { nextAddress } from './client'

export const LOAD_SECONDS = Number(process.env.HARDENING_SECONDS ?? 30)
export const LOAD_CONNECTIONS = Number(process.env.HARDENING_CONNECTIONS ?? 100)

export interface LoadTarget {
  name: string
  method: 'GET' | 'POST'
  path: string
  headers?: Record<string, string>
  body?: string
  /** One distinct X-Forwarded-For per connection (sign-in throttling is per address). */
  distinctAddresses?: boolean
  /** Status codes that are deliberate (e.g. 429 from a throttle). */
  deliberate?: number[]
}

export interface LoadFigures {
  name: string
  method: string
  path: string
  connections: number
  seconds: number
  requests: number
  rps: number
  p50: number
  p99: number
  max: number
  statusCodes: Record<string, number>
  non2xx: number
  deliberate: number
  errors: number
  timeouts: number
  ok: boolean
}

export async function runLoad(baseURL: string, target: LoadTarget, seconds = LOAD_SECONDS, connections = LOAD_CONNECTIONS): Promise<LoadFigures> {
  const result = await autocannon({
    url: `${baseURL}${target.path}`,
    method: target.method,
    headers: { 'content-type': 'application/json', ...target.headers },
    body: target.body,
    connections,
    duration: seconds,
    timeout: 30,
    setupClient: target.distinctAddresses
      ? (client: any) => client.setHeadersAndBody({ 'content-type': 'application/json', ...target.headers, 'x-forwarded-for': nextAddress() }, target.body)
      : undefined,
  } as any)
  const statusCodes = Object.fromEntries(Object.entries(result.statusCodeStats ?? {}).map(([code, v]: [string, any]) => [code, v.count]))
  const deliberate = (target.deliberate ?? []).reduce((sum, code) => sum + (statusCodes[code] ?? 0), 0)
  const figures: LoadFigures = {
    name: target.name,
    method: target.method,
    path: target.path,
    connections,
    seconds,
    requests: result.requests.total,
    rps: result.requests.average,
    p50: result.latency.p50,
    p99: result.latency.p99,
    max: result.latency.max,
    statusCodes,
    non2xx: result.non2xx,
    deliberate,
    errors: result.errors,
    timeouts: result.timeouts,
    ok: false,
  }
  figures.ok = figures.errors === 0 && figures.timeouts === 0 && figures.non2xx - deliberate === 0 && figures.requests > 0
  return figures
}
