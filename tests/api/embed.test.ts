import { describe, expect, inject, it } from 'vitest'
import { as, Client } from '../support/http'

describe('framing', () => {
  it('embed pages may be framed by the configured host origin only', async () => {
    const scientist = await as('amara')
    const notebooks = (await scientist.get('/api/notebooks')).body.notebooks
    const entries = (await scientist.get(`/api/notebooks/${notebooks[0].id}/entries`)).body.entries
    const page = await scientist.get(`/embed/entries/${entries[0].id}`)
    expect(page.status).toBe(200)
    const csp = page.headers.get('content-security-policy')!
    expect(csp).toContain(`frame-ancestors 'self' ${inject('embedHostOrigin')}`)
    expect(page.headers.get('x-frame-options')).toBeNull()
  })

  it('the embedded sign-in may be framed; every other page refuses framing', async () => {
    const scientist = await as('amara')
    const embedSignIn = await scientist.get('/embed/signin')
    expect(embedSignIn.headers.get('content-security-policy')).toContain(inject('embedHostOrigin'))
    const admin = await as('hana')
    const anonymous = new Client('198.18.3.1')
    for (const [client, path] of [[anonymous, '/signin'], [scientist, '/'], [admin, '/admin/people'], [admin, '/audit']] as const) {
      const reply = await client.get(path)
      expect(reply.status, path).toBe(200)
      expect(reply.headers.get('content-security-policy'), path).toContain("frame-ancestors 'none'")
      expect(reply.headers.get('x-frame-options'), path).toBe('DENY')
    }
  })
})
