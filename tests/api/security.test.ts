import { describe, expect, inject, it } from 'vitest'
import { as, Client } from '../support/http'

describe('security headers', () => {
  it('pages carry a CSP that allows only this origin and refuses framing', async () => {
    const reply = await new Client('198.18.2.1').get('/signin')
    const csp = reply.headers.get('content-security-policy')!
    expect(csp).toContain("default-src 'self'")
    expect(csp).toContain("frame-ancestors 'none'")
    expect(csp).toMatch(/script-src 'self'( 'sha256-[A-Za-z0-9+/=]+')*(;|$)/)
    expect(csp).not.toContain('unsafe-eval')
    expect(reply.headers.get('x-content-type-options')).toBe('nosniff')
    expect(reply.headers.get('referrer-policy')).toBe('same-origin')
    expect(reply.headers.get('x-frame-options')).toBe('DENY')
  })

  it('API answers carry nosniff and a deny-all CSP', async () => {
    const reply = await new Client('198.18.2.2').get('/api/health')
    expect(reply.headers.get('x-content-type-options')).toBe('nosniff')
    expect(reply.headers.get('content-security-policy')).toContain("default-src 'none'")
  })
})

describe('cross-origin state changes', () => {
  it('refuses a sign-in or a change posted from another origin', async () => {
    const client = new Client('198.18.2.3')
    const foreign = await client.request('POST', '/api/auth/login', { email: 'a@b.example', password: 'x' }, { origin: 'https://elsewhere.example' })
    expect(foreign.status).toBe(403)
    const scientist = await as('amara')
    const notebooks = (await scientist.get('/api/notebooks')).body.notebooks
    const change = await scientist.request('POST', `/api/notebooks/${notebooks[0].id}/entries`, { title: 'Forged' }, { 'sec-fetch-site': 'cross-site' })
    expect(change.status).toBe(403)
  })

  it('accepts the same origin', async () => {
    const client = new Client('198.18.2.4')
    const url = new URL(inject('baseURL'))
    const reply = await client.request('POST', '/api/auth/login', { email: 'nobody@b.example', password: 'x' }, { origin: url.origin })
    expect(reply.status).toBe(401)
  })
})
