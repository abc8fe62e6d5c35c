import { mkdirSync } from 'node:fs'
import { chromium, type Browser } from 'playwright-core'

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
