import { describe, expect, it } from 'vitest'
import { as, Client } from '../support/http'

/** src and href values of script, link, img and iframe tags. */
function resourceUrls(html: string): string[] {
  return [...html.matchAll(/<(?:script|link|img|iframe|source)\b[^>]*?\s(?:src|href)="([^"]+)"/gi)].map(m => m[1]!)
}

describe('pages', () => {
  it('the sign-in page answers 200 and references no other origin', async () => {
    const reply = await new Client('198.18.1.1').get('/signin')
    expect(reply.status).toBe(200)
    const urls = resourceUrls(reply.body as string)
    expect(urls.length).toBeGreaterThan(0)
    for (const url of urls)
      expect(url, url).toMatch(/^\/(?!\/)/)
  })

  it('the home page sends a visitor to sign in, and answers 200 once signed in', async () => {
    const anonymous = await new Client('198.18.1.2').get('/')
    expect(anonymous.status).toBe(302)
    expect(anonymous.headers.get('location')).toMatch(/^\/signin/)
    const scientist = await as('amara')
    const home = await scientist.get('/')
    expect(home.status).toBe(200)
    for (const url of resourceUrls(home.body as string))
      expect(url, url).toMatch(/^\/(?!\/)/)
  })

  it('each demo person sees what their role allows', async () => {
    const expectations = { amara: [200, 403, 403], priya: [200, 403, 403], felix: [200, 200, 403], hana: [200, 200, 200] } as const
    for (const [who, [home, audit, people]] of Object.entries(expectations)) {
      const client = await as(who as keyof typeof expectations)
      expect((await client.get('/')).status, `${who} /`).toBe(home)
      expect((await client.get('/audit')).status, `${who} /audit`).toBe(audit)
      expect((await client.get('/admin/people')).status, `${who} /admin/people`).toBe(people)
    }
  })
})
