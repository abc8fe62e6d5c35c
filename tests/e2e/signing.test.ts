import type { Browser, BrowserContext, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { DEMO_PASSWORD } from '../../shared/demo'
import { ARTIFACTS, launchBrowser, signInPage } from '../support/browser'
import { as, demoPerson } from '../support/http'

let browser: Browser
beforeAll(async () => { browser = await launchBrowser() })
afterAll(async () => { await browser?.close() })

const baseURL = () => inject('baseURL')
const PASSPHRASE = 'copper kettle under northern rain'

const signIn = signInPage

async function makeKey(page: Page, shot: string, who: 'amara' | 'priya') {
  await page.getByRole('link', { name: 'Signing keys' }).click()
  await page.getByRole('heading', { name: 'Signing keys', level: 1 }).waitFor()
  await page.getByRole('button', { name: /Make a signing key|Replace this key/ }).click()
  await page.getByLabel('Signing passphrase', { exact: true }).fill('short')
  expect(await page.getByText(/Too short/).isVisible()).toBe(true)
  await page.getByLabel('Signing passphrase', { exact: true }).fill(PASSPHRASE)
  await page.getByLabel('The passphrase again').fill(PASSPHRASE)
  await page.getByLabel('Your account password').fill(DEMO_PASSWORD)
  await page.screenshot({ path: `${ARTIFACTS}/${shot}-form.png`, fullPage: true })
  await page.getByRole('button', { name: 'Make the key' }).click()
  await page.getByText(/Your new key is (ready|registered)/).waitFor({ timeout: 30_000 })
  // Test fixtures gave this person keys before, so this one is a replacement: it waits for a
  // records officer, who confirms it here (through the API, as on Felix's keys page).
  const felix = await as('felix')
  for (const key of (await felix.get('/api/keys/pending')).body.keys as { id: string, person: { email: string } }[]) {
    if (key.person.email === demoPerson(who).email)
      expect((await felix.post(`/api/keys/${key.id}/confirm`, { reason: 'Browser test: checked in person.' })).status).toBe(200)
  }
  await page.reload()
  await page.getByTestId('active-fingerprint').waitFor()
  const fingerprint = await page.getByTestId('active-fingerprint').innerText()
  expect(fingerprint).toMatch(/^SHA256:([0-9a-f]{4} ){15}[0-9a-f]{4}$/)
  await page.screenshot({ path: `${ARTIFACTS}/${shot}.png`, fullPage: true })
}

describe('signing in the browser', () => {
  it('the author makes a key and signs; a witness in another browser countersigns; verify says verified', async () => {
    // An entry with one calculation block, made through the API as the editor would save it.
    const amaraApi = await as('amara')
    const notebooks = (await amaraApi.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
    const infrared = notebooks.find(n => n.name.startsWith('Infrared'))!.id
    const created = await amaraApi.post(`/api/notebooks/${infrared}/entries`, {
      title: 'Bending-mode populations before the heated series',
      content: {
        type: 'doc',
        content: [
          { type: 'paragraph', content: [{ type: 'text', text: 'Populations of the ground and first bending level at the bath temperature.' }] },
          { type: 'calculationBlock', attrs: { blockId: '7f0c2b1e-1d1a-4a5b-8c9d-2e3f4a5b6c7d', kind: 'levels', title: 'Bending mode at 296 K', input: { temperature: '296 K', levels: [{ energy: '0 cm^-1' }, { energy: '667 cm^-1', degeneracy: 2 }] }, collapsed: false } },
        ],
      },
    })
    expect(created.status).toBe(201)
    const entryUrl = `${baseURL()}/entries/${created.body.entry.id}`

    const authorContext = await browser.newContext({ viewport: { width: 1280, height: 900 } })
    const author = await signIn(authorContext, 'amara')
    await makeKey(author, 'signing-key-author', 'amara')

    await author.goto(entryUrl)
    await author.getByRole('button', { name: 'Sign this version' }).click()
    const dialog = author.getByRole('dialog')
    await dialog.getByTestId('statement-text').waitFor()
    expect(await dialog.getByText(/recomputed on this page/).isVisible()).toBe(true)

    // A wrong passphrase is caught in the browser; nothing is posted.
    const posted: string[] = []
    author.on('request', (request) => { if (request.method() === 'POST') posted.push(new URL(request.url()).pathname) })
    await dialog.getByLabel('Signing passphrase').fill('not my passphrase at all')
    await dialog.getByRole('button', { name: 'Sign', exact: true }).click()
    await dialog.getByText('That passphrase does not open your signing key').waitFor({ timeout: 30_000 })
    expect(posted.filter(path => path.endsWith('/sign'))).toEqual([])
    await author.screenshot({ path: `${ARTIFACTS}/signing-wrong-passphrase.png` })

    await dialog.getByLabel('Signing passphrase').fill(PASSPHRASE)
    await author.screenshot({ path: `${ARTIFACTS}/signing-dialog.png` })
    await dialog.getByRole('button', { name: 'Sign', exact: true }).click()
    await author.getByText('Signed. Now request a witness.').waitFor({ timeout: 30_000 })
    expect(posted.filter(path => path.endsWith('/sign'))).toHaveLength(1)
    await author.getByText('Signed — awaiting witness').first().waitFor()

    await author.getByLabel('Request witness').selectOption({ label: 'Priya Natarajan' })
    await author.getByRole('button', { name: 'Request witness' }).click()
    await author.getByText('Priya Natarajan was asked by e-mail.').waitFor()
    await author.screenshot({ path: `${ARTIFACTS}/signing-signed.png`, fullPage: true })

    const witnessContext = await browser.newContext({ viewport: { width: 1280, height: 900 } })
    const witness = await signIn(witnessContext, 'priya')
    await makeKey(witness, 'signing-key-witness', 'priya')
    await witness.goto(entryUrl)
    await witness.getByTestId('witness-view').getByText(/recomputed in this browser agree with the record/).waitFor()
    await witness.screenshot({ path: `${ARTIFACTS}/signing-witness-view.png`, fullPage: true })
    await witness.getByRole('button', { name: 'Countersign' }).click()
    const witnessDialog = witness.getByRole('dialog')
    expect(await witnessDialog.getByTestId('statement-text').innerText()).toMatch(/read this record/)
    await witnessDialog.getByLabel('Signing passphrase').fill(PASSPHRASE)
    await witnessDialog.getByRole('button', { name: 'Countersign' }).click()
    await witness.getByText('Countersigned. The record is witnessed.').waitFor({ timeout: 30_000 })
    await witness.getByText('Witnessed').first().waitFor()

    await witness.getByRole('button', { name: 'Verify' }).click()
    const result = witness.getByTestId('verify-result')
    await result.waitFor()
    expect(await result.innerText()).toMatch(/Verified: version 1/)
    await witness.screenshot({ path: `${ARTIFACTS}/signing-witnessed.png`, fullPage: true })

    await authorContext.close()
    await witnessContext.close()
  }, 180_000)

  it('the admin sees the witness request in the caught mail', async () => {
    const context = await browser.newContext({ viewport: { width: 1100, height: 800 } })
    const page = await context.newPage()
    await page.goto(`${baseURL()}/signin`)
    await page.getByLabel('E-mail').fill(demoPerson('hana').email)
    await page.getByLabel('Password').fill(DEMO_PASSWORD)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.getByRole('heading', { name: 'Notebooks', level: 1 }).waitFor()
    await page.goto(`${baseURL()}/admin/mail`)
    await page.getByText('Witness request: Bending-mode populations before the heated series').first().waitFor()
    await page.screenshot({ path: `${ARTIFACTS}/signing-caught-mail.png`, fullPage: true })
    await context.close()
  })
})
