import { mkdirSync } from 'node:fs'
import { inject } from 'vitest'
import { chromium, type Browser, type BrowserContext, type Page } from 'playwright-core'
import { DEMO_PASSWORD } from '../../shared/demo'
import { demoPerson, type DemoKey } from './http'

export const ARTIFACTS = 'test-artifacts/e2e'

/** Debian's Chromium, headless, with the flags that keep it off the network (STACK.md). */
export async function launchBrowser(): Promise<Browser> {
  mkdirSync(ARTIFACTS, { recursive: true })
  return chromium.launch({
    executablePath: process.env.CHROMIUM_PATH ?? '/usr/bin/chromium',
    args: ['--headless', '--no-sandbox', '--disable-gpu', '--disable-quic', '--no-first-run',
      '--disable-background-networking', '--disable-component-update', '--disable-sync'],
  })
}

/** A new page in `context`, signed in as a demo person through the sign-in form. */
export async function signInPage(context: BrowserContext, who: DemoKey): Promise<Page> {
  const page = await context.newPage()
  await page.goto(`${inject('baseURL')}/signin`)
  await page.getByLabel('E-mail').fill(demoPerson(who).email)
  await page.getByLabel('Password').fill(DEMO_PASSWORD)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.getByRole('heading', { name: 'Notebooks', level: 1 }).waitFor()
  return page
}
