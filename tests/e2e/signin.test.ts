import type { Browser } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { DEMO_PASSWORD, DEMO_PEOPLE } from '../../shared/demo'
import { ARTIFACTS, launchBrowser } from '../support/browser'

let browser: Browser
beforeAll(async () => { browser = await launchBrowser() })
afterAll(async () => { await browser?.close() })

const baseURL = () => inject('baseURL')
const scientist = DEMO_PEOPLE.find(p => p.key === 'amara')!

describe('in the browser', () => {
  it('the demo scientist signs in, opens a notebook and sees its entries; nothing loads from another origin', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 860 } })
    const page = await context.newPage()
    const foreign: string[] = []
    page.on('request', (request) => {
      const url = request.url()
      if (!url.startsWith(baseURL()) && !url.startsWith('data:'))
        foreign.push(url)
    })

    await page.goto(`${baseURL()}/`)
    await page.waitForURL(/\/signin/)
    // Demo mode shows the demo lab's people on the sign-in page.
    await page.getByRole('heading', { name: 'Demo lab' }).waitFor()
    await page.screenshot({ path: `${ARTIFACTS}/signin.png` })

    await page.getByLabel('E-mail').fill(scientist.email)
    await page.getByLabel('Password').fill(DEMO_PASSWORD)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.getByRole('heading', { name: 'Notebooks', level: 1 }).waitFor()
    expect(await page.getByText(scientist.name).isVisible()).toBe(true)

    await page.getByRole('link', { name: 'Infrared line surveys — cell B' }).click()
    await page.getByRole('heading', { name: 'Infrared line surveys — cell B' }).waitFor()
    const rows = page.locator('table tbody tr')
    await rows.first().waitFor()
    const titles = await page.locator('table tbody tr td:first-child').allInnerTexts()
    expect(titles).toContain('Cell B baseline run, week 14')
    // Other test files add entries to this notebook, so only the newest demo entries are on page one.
    expect(titles.length).toBeGreaterThan(0)
    expect(await page.locator('table tbody').getByText('Draft').first().isVisible()).toBe(true)
    await page.screenshot({ path: `${ARTIFACTS}/notebook.png`, fullPage: true })

    // The font is shipped with the app.
    const font = await page.evaluate(() => getComputedStyle(document.body).fontFamily)
    expect(font).toMatch(/Atkinson Hyperlegible/)
    expect(await page.evaluate(async () => { await document.fonts.ready; return document.fonts.check('16px "Atkinson Hyperlegible"') })).toBe(true)

    await page.getByRole('link', { name: 'Cell B baseline run, week 14' }).click()
    await page.getByRole('heading', { name: 'Cell B baseline run, week 14' }).waitFor()
    expect(await page.getByText('Baseline absorption survey').isVisible()).toBe(true)
    await page.screenshot({ path: `${ARTIFACTS}/entry.png`, fullPage: true })

    await page.getByRole('button', { name: 'Sign out' }).click()
    await page.waitForURL(/\/signin/)
    expect(foreign).toEqual([])
    await context.close()
  })

  it('sends a person without the role away from an admin page', async () => {
    const context = await browser.newContext()
    const page = await context.newPage()
    await page.goto(`${baseURL()}/signin`)
    await page.getByLabel('E-mail').fill(scientist.email)
    await page.getByLabel('Password').fill(DEMO_PASSWORD)
    await page.getByRole('button', { name: 'Sign in' }).click()
    await page.getByRole('heading', { name: 'Notebooks', level: 1 }).waitFor()
    const response = await page.goto(`${baseURL()}/admin/people`)
    expect(response?.status()).toBe(403)
    await context.close()
  })
})
