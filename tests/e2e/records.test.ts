import { writeFileSync } from 'node:fs'
import type { Browser, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { canonicalJson } from '../../shared/records'
import { DEMO_PASSWORD, DEMO_PEOPLE } from '../../shared/demo'
import { ARTIFACTS, launchBrowser } from '../support/browser'
import { createSignedRecord, type StoredRecord } from '../support/signedRecords'

let browser: Browser
let record: StoredRecord
const baseURL = () => inject('baseURL')
const felix = DEMO_PEOPLE.find(p => p.key === 'felix')!

beforeAll(async () => {
  browser = await launchBrowser()
  record = await createSignedRecord(inject('databaseURL'), {
    authorEmail: 'amara.lindqvist@kestrel-ridge.example', witnessEmail: 'priya.natarajan@kestrel-ridge.example',
    notebook: 'Infrared', title: 'Browser check: band populations at 1500 K', signedAt: '2026-05-06T07:08:09.000Z',
  })
})
afterAll(async () => { await browser?.close() })

async function signIn(page: Page) {
  await page.goto(`${baseURL()}/signin`)
  await page.getByLabel('E-mail').fill(felix.email)
  await page.getByLabel('Password').fill(DEMO_PASSWORD)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.getByRole('heading', { name: 'Notebooks', level: 1 }).waitFor()
}

describe('records officer in the browser', () => {
  it('finds a signed record, starts a bulk export and downloads it; verifies a bundle and a tampered one', async () => {
    const context = await browser.newContext({ viewport: { width: 1280, height: 900 }, acceptDownloads: true })
    const page = await context.newPage()
    await signIn(page)
    await page.getByRole('link', { name: 'Signed records' }).click()
    await page.getByRole('heading', { name: 'Signed records', level: 1 }).waitFor()
    await page.getByLabel('Title contains').fill('Browser check')
    const row = page.locator('table tbody tr', { hasText: 'Browser check: band populations' })
    await row.waitFor()
    // The title filter applies after a short pause in typing.
    await expect.poll(() => page.locator('table tbody tr').count(), { timeout: 10_000 }).toBe(1)
    expect(await row.innerText()).toContain('Priya Natarajan')
    await row.getByRole('checkbox').check()
    const started = page.waitForResponse(response => response.url().endsWith('/api/exports') && response.request().method() === 'POST')
    await page.getByRole('button', { name: 'Export 1 selected' }).click()
    const { job } = await (await started).json() as { job: { id: string } }
    // This job's panel: its progress bar reaches 1 of 1 and its download link appears.
    await page.locator(`a[href="/api/exports/${job.id}/download"]`).waitFor({ timeout: 60_000 })
    const panel = page.locator('div', { has: page.locator(`a[href="/api/exports/${job.id}/download"]`) }).filter({ has: page.getByRole('progressbar') }).last()
    expect(await panel.getByRole('progressbar').getAttribute('aria-valuenow')).toBe('1')
    await page.screenshot({ path: `${ARTIFACTS}/records.png`, fullPage: true })

    const bundleFile = `${ARTIFACTS}/browser-bundle.json`
    writeFileSync(bundleFile, canonicalJson(record.bundle as never))
    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Verify' }).click()
    await page.getByRole('heading', { name: 'Verify a record' }).waitFor()
    await page.getByLabel('Bundle or PDF').setInputFiles(bundleFile)
    await page.getByRole('button', { name: 'Verify', exact: true }).click()
    await page.getByText('Verified: 2 signature(s) valid').waitFor()
    expect(await page.getByText(record.bundle.recordHash).isVisible()).toBe(true)
    await page.screenshot({ path: `${ARTIFACTS}/verify-ok.png`, fullPage: true })

    const tampered = structuredClone(record.bundle)
    tampered.record.entry.title = 'Changed after signing'
    const tamperedFile = `${ARTIFACTS}/browser-bundle-tampered.json`
    writeFileSync(tamperedFile, JSON.stringify(tampered))
    await page.getByLabel('Bundle or PDF').setInputFiles(tamperedFile)
    await page.getByRole('button', { name: 'Verify', exact: true }).click()
    await page.getByText('Not verified').waitFor()
    expect(await page.getByText('What failed').isVisible()).toBe(true)
    await page.screenshot({ path: `${ARTIFACTS}/verify-failed.png`, fullPage: true })

    await page.getByRole('navigation', { name: 'Main' }).getByRole('link', { name: 'Audit trail' }).click()
    await page.getByLabel('Action').selectOption('export_requested')
    await page.locator('table tbody tr', { hasText: 'export_requested' }).first().waitFor()
    await page.getByRole('button', { name: 'Check the whole chain' }).click()
    await page.getByText(/Chain intact/).waitFor()
    await page.screenshot({ path: `${ARTIFACTS}/audit.png`, fullPage: true })
    await context.close()
  })
})
