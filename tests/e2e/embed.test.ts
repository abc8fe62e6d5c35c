import { createServer, type Server } from 'node:http'
import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { DEMO_PASSWORD, DEMO_PEOPLE } from '../../shared/demo'
import { ARTIFACTS, launchBrowser } from '../support/browser'

let browser: Browser
let host: Server
let frameSrc = ''
const baseURL = () => inject('baseURL')
const hostOrigin = () => inject('embedHostOrigin')

/** A stand-in host notebook page on another loopback port, collecting the frame's messages. */
function hostPage() {
  return `<!doctype html><html><head><title>Host notebook</title></head><body>
<h1>Host notebook system</h1>
<iframe id="thermotome" title="Thermotome entry" src="${frameSrc}" style="width:900px;height:600px;border:1px solid #999"></iframe>
<script>
  window.received = [];
  window.addEventListener('message', (event) => {
    if (event.origin === ${JSON.stringify(baseURL())} && event.data && event.data.source === 'thermotome') window.received.push(event.data);
  });
</script></body></html>`
}

beforeAll(async () => {
  browser = await launchBrowser()
  host = createServer((request, response) => {
    response.writeHead(200, { 'content-type': 'text/html; charset=utf-8' })
    response.end(hostPage())
  })
  await new Promise<void>(resolve => host.listen(Number(new URL(hostOrigin()).port), '127.0.0.1', resolve))
})
afterAll(async () => {
  await browser?.close()
  await new Promise(resolve => host?.close(resolve))
})

describe('embedded in a host notebook', () => {
  it('signs in inside the frame, starts an entry, and tells the host what happened', async () => {
    const context = await browser.newContext({ viewport: { width: 1000, height: 760 } })
    const page = await context.newPage()
    // Find the notebook through the API with a signed-in browser session.
    await page.goto(`${baseURL()}/signin`)
    const notebooks = await page.evaluate(async (person) => {
      await fetch('/api/auth/login', { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify(person) })
      return (await (await fetch('/api/notebooks')).json()).notebooks
    }, { email: DEMO_PEOPLE.find(p => p.key === 'amara')!.email, password: DEMO_PASSWORD })
    const notebook = notebooks.find((n: { name: string }) => n.name.startsWith('Infrared'))
    await page.evaluate(() => fetch('/api/auth/logout', { method: 'POST' }))

    frameSrc = `${baseURL()}/embed/notebooks/${notebook.id}/new?host=${encodeURIComponent(hostOrigin())}`
    await page.goto(`${hostOrigin()}/`)
    const frame = page.frameLocator('#thermotome')
    // Not signed in: the frame shows the embedded sign-in (the ordinary one refuses framing).
    await frame.getByRole('heading', { name: 'Sign in to Thermotome' }).waitFor()
    await frame.getByLabel('E-mail').fill(DEMO_PEOPLE.find(p => p.key === 'amara')!.email)
    await frame.getByLabel('Password').fill(DEMO_PASSWORD)
    await frame.getByRole('button', { name: 'Sign in' }).click()
    await frame.getByLabel('Title').fill('Started from the host notebook')
    await frame.getByRole('button', { name: 'Start entry' }).click()
    await frame.getByRole('heading', { name: 'Started from the host notebook' }).waitFor()
    // The author edits inside the frame; the autosave tells the host.
    const editor = frame.locator('.ProseMirror')
    await editor.waitFor()
    await editor.click()
    await page.keyboard.type('Written inside the host notebook.')
    await page.waitForFunction(() => (window as unknown as { received: { event: string }[] }).received.some(m => m.event === 'entry-saved'), undefined, { timeout: 20_000 })
    await page.waitForFunction(() => (window as unknown as { received: { event: string }[] }).received.some(m => m.event === 'height-changed'))
    const received = await page.evaluate(() => (window as unknown as { received: { event: string, entryId?: string }[] }).received)
    const events = received.map(m => m.event)
    expect(events).toContain('entry-created')
    expect(events).toContain('ready')
    expect(events).toContain('height-changed')
    expect(received.find(m => m.event === 'entry-saved')).toMatchObject({ entryId: expect.stringMatching(/^[0-9a-f-]{36}$/), lockVersion: expect.any(Number) })
    const created = received.find(m => m.event === 'entry-created')!
    expect(created.entryId).toMatch(/^[0-9a-f-]{36}$/)
    await page.screenshot({ path: `${ARTIFACTS}/embed-host.png` })
    await context.close()
  })

  it('an ordinary page refuses to load inside the host frame', async () => {
    const context = await browser.newContext()
    const page = await context.newPage()
    frameSrc = `${baseURL()}/signin`
    await page.goto(`${hostOrigin()}/`)
    await page.waitForTimeout(1500)
    const frame = page.frames().find(f => f.url().startsWith(baseURL()))
    // Chromium blocks the document: the frame stays empty (no sign-in heading inside it).
    const hasHeading = frame ? await frame.locator('h1').count().catch(() => 0) : 0
    expect(hasHeading).toBe(0)
    await context.close()
  })
})
