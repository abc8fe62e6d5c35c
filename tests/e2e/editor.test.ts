import { readFileSync, writeFileSync } from 'node:fs'
import { gzipSync } from 'node:zlib'
import type { Browser, BrowserContext, Page } from 'playwright-core'
import { afterAll, beforeAll, describe, expect, inject, it } from 'vitest'
import { DEMO_PASSWORD, DEMO_PEOPLE } from '../../shared/demo'
import { evaluate, listKinds } from '../../shared/thermo'
import { ARTIFACTS, launchBrowser } from '../support/browser'
import { as } from '../support/http'

let browser: Browser
beforeAll(async () => { browser = await launchBrowser() })
afterAll(async () => { await browser?.close() })

const baseURL = () => inject('baseURL')
const person = (key: string) => DEMO_PEOPLE.find(p => p.key === key)!

/** Second radiation constant c₂ = hc/k = 1.438 776 877 cm K (CODATA 2018). */
const SECOND_RADIATION_CONSTANT = 1.438776877

async function signedInPage(key: string, viewport = { width: 1280, height: 900 }): Promise<{ context: BrowserContext, page: Page }> {
  const context = await browser.newContext({ viewport })
  const page = await context.newPage()
  await page.goto(`${baseURL()}/signin`)
  await page.getByLabel('E-mail').fill(person(key).email)
  await page.getByLabel('Password').fill(DEMO_PASSWORD)
  await page.getByRole('button', { name: 'Sign in' }).click()
  await page.getByRole('heading', { name: 'Notebooks', level: 1 }).waitFor()
  return { context, page }
}

/** Reads a number as the page shows it ("2.5×10⁻⁵", "−0.3", "0.25"). */
function screenNumber(text: string): number {
  const superscripts: Record<string, string> = { '⁰': '0', '¹': '1', '²': '2', '³': '3', '⁴': '4', '⁵': '5', '⁶': '6', '⁷': '7', '⁸': '8', '⁹': '9', '⁻': '-' }
  const plain = text.trim().replace(/−/g, '-').replace(/[⁰¹²³⁴⁵⁶⁷⁸⁹⁻]/g, c => superscripts[c]!)
  const power = /^(-?[\d.]+)?×?10(-?\d+)$/.exec(plain)
  if (power) return Number(power[1] ?? 1) * 10 ** Number(power[2])
  return Number(plain)
}

async function axeViolations(page: Page) {
  // Evaluated through the debugging protocol: the page's CSP (no inline scripts) stays in force.
  await page.evaluate(readFileSync('node_modules/axe-core/axe.min.js', 'utf8'))
  const violations = await page.evaluate(async () => {
    const result = await (window as unknown as { axe: { run: (context: Document, options: unknown) => Promise<{ violations: { id: string, impact: string, help: string, nodes: { target: string[] }[] }[] }> } })
      .axe.run(document, { resultTypes: ['violations'] })
    return result.violations.map(v => ({ id: v.id, impact: v.impact, help: v.help, targets: v.nodes.slice(0, 3).map(n => n.target.join(' ')) }))
  })
  return violations.filter(v => v.impact === 'serious' || v.impact === 'critical')
}

async function waitSaved(page: Page) {
  await page.getByRole('status').filter({ hasText: /All changes saved/ }).waitFor({ timeout: 15_000 })
}

async function pasteInto(page: Page, selector: string, text: string) {
  await page.locator(selector).focus()
  await page.locator(selector).evaluate((element, pasted) => {
    const data = new DataTransfer()
    data.setData('text/plain', pasted)
    element.dispatchEvent(new ClipboardEvent('paste', { clipboardData: data, bubbles: true, cancelable: true }))
  }, text)
}

describe('the entry editor in the browser', () => {
  it('writes text, inserts a levels block by keyboard, enters three levels, shows the engine\'s populations, adds a vibration block and keeps it all', async () => {
    const { context, page } = await signedInPage('amara')
    const errors: string[] = []
    page.on('pageerror', error => errors.push(error.message))
    await page.getByRole('link', { name: 'Infrared line surveys — cell B' }).click()
    const title = `Ladder populations ${Date.now()}`
    await page.getByLabel('New entry title').fill(title)
    await page.getByRole('button', { name: 'Start entry' }).click()
    await page.getByRole('heading', { name: title, level: 1 }).waitFor()

    const editor = page.locator('.ProseMirror')
    await editor.waitFor()
    await editor.click()
    await page.keyboard.type('Populations of an invented three-level scheme at the cell temperature.')
    await page.keyboard.press('Enter')

    // Keyboard only: "/" opens the picker, typing filters, Enter inserts and focus lands in the block's first field.
    await page.keyboard.type('/')
    const picker = page.getByRole('dialog', { name: 'Insert a calculation block' })
    await picker.waitFor()
    expect(await picker.getByRole('option').count()).toBe(listKinds().length)
    await page.keyboard.type('populations')
    await page.keyboard.press('Enter')
    const levelsBlock = page.locator('.ProseMirror [data-kind="levels"]')
    await levelsBlock.waitFor()
    expect(await page.evaluate(() => document.activeElement?.id)).toMatch(/-temperature$/)

    // Replace the example levels by three of our own: one typed, two pasted from a spreadsheet.
    for (let row = 3; row >= 1; row--) await levelsBlock.getByRole('button', { name: 'Remove level 1' }).click()
    expect(await levelsBlock.getByLabel(/^Energy, level/).count()).toBe(0)
    await levelsBlock.getByRole('button', { name: 'Add level' }).click()
    await levelsBlock.getByLabel('Label, level 1').fill('ground')
    await levelsBlock.getByLabel('Energy, level 1').fill('0 cm^-1')
    await levelsBlock.getByRole('button', { name: 'Add level' }).click()
    const secondLabel = await levelsBlock.getByLabel('Label, level 2').getAttribute('id')
    await pasteInto(page, `[id="${secondLabel}"]`, 'first excited\t120 cm^-1\t3\nsecond excited\t350 cm^-1\t5\n')
    expect(await levelsBlock.getByLabel('Energy, level 3').inputValue()).toBe('350 cm^-1')
    expect(await levelsBlock.getByLabel('Degeneracy g, level 2').inputValue()).toBe('3')

    // An invalid temperature marks the field, says why and keeps what was typed.
    const temperature = levelsBlock.getByLabel('Temperature', { exact: true })
    await temperature.fill('450')
    await expect.poll(() => temperature.getAttribute('aria-invalid')).toBe('true')
    expect(await levelsBlock.locator('.field-error').first().innerText()).toMatch(/unit/)
    expect(await temperature.inputValue()).toBe('450')
    await page.screenshot({ path: `${ARTIFACTS}/editor-invalid.png`, fullPage: true })
    await temperature.fill('450 K')
    await expect.poll(() => temperature.getAttribute('aria-invalid')).toBe(null)

    const input = {
      levels: [
        { label: 'ground', energy: '0 cm^-1', degeneracy: 1 },
        { label: 'first excited', energy: '120 cm^-1', degeneracy: 3 },
        { label: 'second excited', energy: '350 cm^-1', degeneracy: 5 },
      ],
      temperature: '450 K',
      amount: '1 mol',
    }
    const engine = evaluate({ kind: 'levels', input }).result.levels.map((level: { fraction: number }) => level.fraction) as number[]
    // Independently: p_i = g_i exp(−c₂ ν̃_i / T) / q.
    const weights = [[0, 1], [120, 3], [350, 5]].map(([wavenumber, g]) => g! * Math.exp(-SECOND_RADIATION_CONSTANT * wavenumber! / 450))
    const q = weights.reduce((sum, w) => sum + w, 0)
    // c₂ is quoted to 10 digits: agreement to about 1e-9.
    weights.forEach((w, index) => expect(Math.abs(engine[index]! - w / q)).toBeLessThan(1e-9))

    const fractionCells = levelsBlock.locator('table:has(caption:text("Populations by level")) tbody tr td:nth-child(5)')
    await expect.poll(async () => (await fractionCells.allInnerTexts()).length).toBe(3)
    await expect.poll(async () => {
      const shown = (await fractionCells.allInnerTexts()).map(screenNumber)
      return shown.every((value, index) => Math.abs(value - engine[index]!) <= 1e-5 * engine[index]!)
    }).toBe(true)
    expect(await levelsBlock.locator('figure svg').count()).toBeGreaterThanOrEqual(1)
    expect(await levelsBlock.locator('figcaption').first().innerText()).toMatch(/Population/)

    // A vibration block from the toolbar, then rename it.
    await editor.press('End')
    await page.getByRole('button', { name: 'Calculation block' }).click()
    await picker.waitFor()
    await page.keyboard.type('vibrational')
    await page.keyboard.press('Enter')
    const vibrationBlock = page.locator('.ProseMirror [data-kind="vibration"]')
    await vibrationBlock.waitFor()
    await vibrationBlock.getByLabel('Block title').fill('Hot-band check')
    await vibrationBlock.locator('table:has(caption:text("Modes"))').waitFor()
    await waitSaved(page)
    await page.screenshot({ path: `${ARTIFACTS}/editor.png`, fullPage: true })

    const axe = await axeViolations(page)
    expect(axe, JSON.stringify(axe, null, 1)).toEqual([])

    // Everything is kept: reload and find the text, both blocks and the typed values.
    await page.reload()
    await page.locator('.ProseMirror [data-kind="vibration"]').waitFor()
    expect(await page.locator('.ProseMirror').innerText()).toContain('invented three-level scheme')
    const reloadedLevels = page.locator('.ProseMirror [data-kind="levels"]')
    expect(await reloadedLevels.getByLabel('Temperature', { exact: true }).inputValue()).toBe('450 K')
    expect(await reloadedLevels.getByLabel('Energy, level 2').inputValue()).toBe('120 cm^-1')
    expect(await reloadedLevels.getByLabel('Label, level 3').inputValue()).toBe('second excited')
    expect(await page.locator('.ProseMirror [data-kind="vibration"]').getByLabel('Block title').inputValue()).toBe('Hot-band check')
    const shownAfterReload = (await reloadedLevels.locator('table:has(caption:text("Populations by level")) tbody tr td:nth-child(5)').allInnerTexts()).map(screenNumber)
    shownAfterReload.forEach((value, index) => expect(Math.abs(value - engine[index]!)).toBeLessThanOrEqual(1e-5 * engine[index]!))

    // Collapse and move by keyboard: the vibration block goes above the levels block.
    const vibration = page.locator('.ProseMirror [data-kind="vibration"]')
    // Each press moves the block past one neighbour (a paragraph or a block); focus stays on the button.
    await vibration.getByRole('button', { name: /^Move .* up$/ }).focus()
    const kindsInOrder = () => page.locator('.ProseMirror .calc-block').evaluateAll(blocks => blocks.map(block => block.getAttribute('data-kind')))
    for (let press = 0; press < 4 && (await kindsInOrder())[0] !== 'vibration'; press++) {
      await page.keyboard.press('Enter')
      await page.waitForTimeout(300)
      expect(await page.evaluate(() => document.activeElement?.getAttribute('data-control'))).toMatch(/^(up|down)$/)
    }
    expect(await kindsInOrder()).toEqual(['vibration', 'levels'])
    // The block keeps the focus on its move buttons (up is disabled at the top, so down takes it).
    expect(await page.evaluate(() => document.activeElement?.getAttribute('data-control'))).toMatch(/^(up|down)$/)
    await page.locator('.ProseMirror [data-kind="vibration"]').getByRole('button', { name: /^Collapse/ }).click()
    expect(await page.locator('.ProseMirror [data-kind="vibration"] .calc-body').isVisible()).toBe(false)
    await waitSaved(page)

    // Leaving with unsaved changes asks first.
    await page.locator('.ProseMirror p').first().click()
    await page.keyboard.press('End')
    await page.keyboard.type(' Checked twice.')
    let question = ''
    page.once('dialog', (dialog) => { question = dialog.message(); void dialog.dismiss() })
    await page.getByRole('link', { name: 'Infrared line surveys — cell B' }).click()
    await expect.poll(() => question).toMatch(/not saved/)
    expect(page.url()).toContain('/entries/')
    await waitSaved(page)

    // A witness reads the same entry without the editor: results computed, no form fields.
    const { context: witnessContext, page: witnessPage } = await signedInPage('priya')
    await witnessPage.goto(page.url())
    await witnessPage.getByRole('heading', { name: title, level: 1 }).waitFor()
    expect(await witnessPage.locator('.ProseMirror').count()).toBe(0)
    const readOnlyCells = witnessPage.locator('[data-kind="levels"] table:has(caption:text("Populations by level")) tbody tr td:nth-child(5)')
    const readOnly = (await readOnlyCells.allInnerTexts()).map(screenNumber)
    readOnly.forEach((value, index) => expect(Math.abs(value - engine[index]!)).toBeLessThanOrEqual(1e-5 * engine[index]!))
    await witnessPage.screenshot({ path: `${ARTIFACTS}/entry-read-only.png`, fullPage: true })
    const witnessAxe = await axeViolations(witnessPage)
    expect(witnessAxe, JSON.stringify(witnessAxe, null, 1)).toEqual([])
    await witnessContext.close()

    expect(errors).toEqual([])
    await context.close()
  })

  it('uploads a CSV to an entry and imports its lines into a Boltzmann-plot block', async () => {
    const client = await as('amara')
    const notebooks = (await client.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
    const infrared = notebooks.find(n => n.name.startsWith('Infrared'))!
    const entry = (await client.post(`/api/notebooks/${infrared.id}/entries`, { title: 'Line table from a file' })).body.entry
    const { context, page } = await signedInPage('amara')
    await page.goto(`${baseURL()}/entries/${entry.id}`)
    await page.locator('.ProseMirror').waitFor()

    // Invented line intensities (demonstration values, not measurements).
    const csv = 'line,upper energy (cm-1),g,intensity,sigma\nR(2),11.5,5,0.80,0.02\nR(6),81.0,13,1.05,0.03\nR(10),212.0,21,0.78,0.02\nR(14),404.0,29,0.35,0.01\n'
    await page.locator('#attachment-upload').setInputFiles({ name: 'lines.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) })
    await page.getByRole('complementary', { name: 'Record' }).getByText('lines.csv').first().waitFor({ timeout: 15_000 })

    await page.locator('.ProseMirror').click()
    await page.keyboard.type('/')
    await page.keyboard.type('Boltzmann')
    await page.keyboard.press('Enter')
    const block = page.locator('.ProseMirror [data-kind="boltzmannPlot"]')
    await block.waitFor()
    await block.getByRole('button', { name: 'Import from CSV…' }).click()
    const dialog = page.getByRole('dialog', { name: /Import a table of measured lines/ })
    await dialog.waitFor()
    const option = await dialog.locator('#import-attachment option', { hasText: 'lines.csv' }).getAttribute('value')
    await dialog.getByLabel('Data file').selectOption(option!)
    const importButton = dialog.getByRole('button', { name: 'Import 4 rows' })
    await expect.poll(() => importButton.isEnabled(), { timeout: 15_000 }).toBe(true)
    await page.screenshot({ path: `${ARTIFACTS}/editor-csv-import.png`, fullPage: true })
    await importButton.click()
    await dialog.waitFor({ state: 'detached' })

    expect(await block.getByLabel('Upper energy, line 3').inputValue()).toMatch(/^212(\.0)? cm\^-1$/)
    expect(await block.getByLabel('Intensity I, line 4').inputValue()).toBe('0.35')
    const input = { lines: [[11.5, 5, 0.8, 0.02], [81, 13, 1.05, 0.03], [212, 21, 0.78, 0.02], [404, 29, 0.35, 0.01]].map(([energy, g, intensity, uncertainty], index) => ({ label: `R(${[2, 6, 10, 14][index]})`, upperEnergy: `${energy} cm^-1`, degeneracy: g, intensity, uncertainty })) }
    const fit = evaluate({ kind: 'boltzmannPlot', input }).result as { temperature: number, temperatureUncertainty: number }
    const shown = block.locator('.calc-results .calc-values > div').filter({ hasText: /^Excitation temperature/ }).locator('dd button').first()
    // Shown rounded to its standard uncertainty (GUM 7.2.6): within half the uncertainty of the engine's value.
    await expect.poll(async () => Math.abs(screenNumber((await shown.innerText()).split('±')[0]!) - fit.temperature) <= fit.temperatureUncertainty / 2, { timeout: 10_000 }).toBe(true)
    await waitSaved(page)
    await context.close()
  })

  it('imports a data file of 3,000 levels into a levels block as a level table: summary, results, saved and shown again', async () => {
    const client = await as('amara')
    const notebooks = (await client.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
    const infrared = notebooks.find(n => n.name.startsWith('Infrared'))!
    const entry = (await client.post(`/api/notebooks/${infrared.id}/entries`, { title: 'A long level list from a file' })).body.entry
    const { context, page } = await signedInPage('amara')
    const errors: string[] = []
    page.on('pageerror', error => errors.push(error.message))
    await page.goto(`${baseURL()}/entries/${entry.id}`)
    await page.locator('.ProseMirror').waitFor()

    // An invented ladder (not a molecule's data): 7.5 cm^-1 apart, g cycling 1, 2, 3.
    const count = 3000
    const energies = Array.from({ length: count }, (_, index) => index * 7.5)
    const degeneracies = energies.map((_, index) => 1 + (index % 3))
    const csv = ['level,energy (cm-1),g', ...energies.map((energy, index) => `L${index + 1},${energy},${degeneracies[index]}`)].join('\n')
    await page.locator('#attachment-upload').setInputFiles({ name: 'ladder.csv', mimeType: 'text/csv', buffer: Buffer.from(csv) })
    await page.getByRole('complementary', { name: 'Record' }).getByText('ladder.csv').first().waitFor({ timeout: 15_000 })

    await page.locator('.ProseMirror').click()
    await page.keyboard.type('/')
    await page.keyboard.type('populations')
    await page.keyboard.press('Enter')
    const block = page.locator('.ProseMirror [data-kind="levels"]')
    await block.waitFor()
    await block.getByLabel('Temperature', { exact: true }).fill('500 K')
    await block.getByRole('button', { name: 'Import from CSV…' }).click()
    const dialog = page.getByRole('dialog', { name: /Import a table of levels/ })
    await dialog.waitFor()
    const option = await dialog.locator('#import-attachment option', { hasText: 'ladder.csv' }).getAttribute('value')
    await dialog.getByLabel('Data file').selectOption(option!)
    const importButton = dialog.getByRole('button', { name: 'Import 3,000 levels as a level table' })
    await expect.poll(() => importButton.isEnabled(), { timeout: 15_000 }).toBe(true)
    expect(await dialog.getByTestId('level-table-notice').innerText()).toMatch(/This file has 3,000 rows, more than the 500 .* imported as a level table/)
    await page.screenshot({ path: `${ARTIFACTS}/editor-level-table-import.png`, fullPage: true })
    await importButton.click()
    await dialog.waitFor({ state: 'detached' })

    // The block shows a summary, not 3,000 rows of fields; the focus is on its import button.
    const summary = block.getByRole('group', { name: 'Levels' })
    const shown = (term: string) => summary.locator('.calc-values > div').filter({ has: page.locator(`dt:text-is("${term}")`) }).locator('dd')
    await summary.waitFor()
    expect(await block.getByLabel(/^Energy, level/).count()).toBe(0)
    expect(await shown('Levels').innerText()).toBe('3,000')
    expect(await shown('Energy unit').innerText()).toBe('cm^-1')
    expect(await shown('Lowest energy').innerText()).toMatch(/^0\s*cm\^-1$/)
    expect(await shown('Highest energy').innerText()).toMatch(/^22492\.5\s*cm\^-1$/)
    expect(await shown('Degeneracies').innerText()).toBe('given')
    expect(await shown('Labels').innerText()).toBe('given')
    expect(await summary.getByRole('button', { name: 'Edit as rows' }).count()).toBe(0)
    await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('data-control'))).toBe('level-table-import')
    // Import again, by keyboard: the same dialog opens; Escape closes it and the focus comes back.
    await page.keyboard.press('Enter')
    await dialog.waitFor()
    await page.keyboard.press('Escape')
    await dialog.waitFor({ state: 'detached' })
    await expect.poll(() => page.evaluate(() => document.activeElement?.getAttribute('data-control'))).toBe('level-table-import')

    // The results are the engine's for the same level table.
    const input = { levelTable: { energyUnit: 'cm^-1', energies, degeneracies, labels: energies.map((_, index) => `L${index + 1}`) }, temperature: '500 K', amount: '1 mol' }
    const expected = evaluate({ kind: 'levels', input }).result
    const resultValue = (label: string) => block.locator('.calc-results .calc-values > div').filter({ hasText: label }).locator('dd button').first()
    const entropyMatches = async (where: typeof block) => {
      const text = await where.locator('.calc-results .calc-values > div').filter({ hasText: /^Molar entropy/ }).locator('dd button').first().innerText()
      return Math.abs(screenNumber(text) - expected.molarEntropy) <= 1e-5 * Math.abs(expected.molarEntropy)
    }
    await expect.poll(() => entropyMatches(block), { timeout: 10_000 }).toBe(true)
    expect(Math.abs(screenNumber(await resultValue('Partition function from the lowest level').innerText()) - expected.partitionFunctionFromLowest)).toBeLessThanOrEqual(1e-5 * expected.partitionFunctionFromLowest)
    expect(await block.locator('table caption').filter({ hasText: 'Populations by level' }).innerText()).toContain('the first 500 of 3,000 levels')
    await waitSaved(page)
    await page.screenshot({ path: `${ARTIFACTS}/editor-level-table.png`, fullPage: true })
    const axe = await axeViolations(page)
    expect(axe, JSON.stringify(axe, null, 1)).toEqual([])

    // Stored as a level table (numbers, not rows of text), shown again after a reload.
    const stored = (await client.get(`/api/entries/${entry.id}`)).body.entry.content.content.find((node: { type: string }) => node.type === 'calculationBlock').attrs.input
    expect(stored.levels).toBeUndefined()
    expect(stored.levelTable.energies).toEqual(energies)
    expect(stored.levelTable.degeneracies).toEqual(degeneracies)
    await page.reload()
    const reloaded = page.locator('.ProseMirror [data-kind="levels"]')
    await reloaded.getByRole('group', { name: 'Levels' }).waitFor()
    expect(await reloaded.getByRole('group', { name: 'Levels' }).locator('.calc-values > div').filter({ has: page.locator('dt:text-is("Levels")') }).locator('dd').innerText()).toBe('3,000')
    await expect.poll(() => entropyMatches(reloaded), { timeout: 10_000 }).toBe(true)

    // The read-only view shows the same summary, without the actions, and the same results.
    const { context: witnessContext, page: witnessPage } = await signedInPage('priya')
    await witnessPage.goto(page.url())
    const readOnly = witnessPage.locator('[data-kind="levels"]')
    // Read-only, the inputs are the presentation's (shared/present): the level count, no actions.
    await readOnly.locator('[data-section="inputs"]').waitFor()
    expect(await readOnly.innerText()).toMatch(/3,000 levels/)
    expect(await readOnly.getByRole('button', { name: /Import|Edit as rows/ }).count()).toBe(0)
    expect(await entropyMatches(readOnly)).toBe(true)
    await witnessContext.close()

    expect(errors).toEqual([])
    await context.close()
  })

  it('a short level table turns into editable rows, and the engine gives the same numbers', async () => {
    const client = await as('amara')
    const notebooks = (await client.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
    const infrared = notebooks.find(n => n.name.startsWith('Infrared'))!
    const entry = (await client.post(`/api/notebooks/${infrared.id}/entries`, { title: 'A short level table' })).body.entry
    const levelTable = { energyUnit: 'eV', energies: [0, 0.05, 0.125], degeneracies: [1, 3, 5], labels: ['X', '', 'B'] }
    const blockAttrs = { blockId: '00000000-0000-4000-8000-00000000a11e', kind: 'levels', title: 'Three levels', input: { levelTable, temperature: '800 K' }, collapsed: false }
    const saved = await client.patch(`/api/entries/${entry.id}`, { lockVersion: entry.lockVersion, content: { type: 'doc', content: [{ type: 'calculationBlock', attrs: blockAttrs }] } })
    expect(saved.status).toBe(200)
    const expected = evaluate({ kind: 'levels', input: blockAttrs.input }).result

    const { context, page } = await signedInPage('amara')
    await page.goto(`${baseURL()}/entries/${entry.id}`)
    const block = page.locator('.ProseMirror [data-kind="levels"]')
    const summary = block.getByRole('group', { name: 'Levels' })
    await summary.waitFor()
    await summary.getByRole('button', { name: 'Edit as rows' }).click()
    await block.getByLabel('Energy, level 3').waitFor()
    await expect.poll(() => page.evaluate(() => document.activeElement?.id)).toMatch(/-levels-0-label$/)
    expect(await block.getByLabel('Energy, level 2').inputValue()).toBe('0.05 eV')
    expect(await block.getByLabel('Label, level 1').inputValue()).toBe('X')
    expect(await block.getByLabel('Label, level 2').inputValue()).toBe('')
    expect(await block.getByLabel('Degeneracy g, level 3').inputValue()).toBe('5')
    const fractionCells = block.locator('table:has(caption:text("Populations by level")) tbody tr td:nth-child(5)')
    await expect.poll(async () => {
      const shown = (await fractionCells.allInnerTexts()).map(screenNumber)
      return shown.length === 3 && shown.every((value, index) => Math.abs(value - expected.levelTable.fractions[index]) <= 1e-5 * expected.levelTable.fractions[index])
    }).toBe(true)
    await waitSaved(page)
    const stored = (await client.get(`/api/entries/${entry.id}`)).body.entry.content.content[0].attrs.input
    expect(stored.levelTable).toBeUndefined()
    expect(stored.levels).toEqual([{ label: 'X', energy: '0 eV', degeneracy: 1 }, { energy: '0.05 eV', degeneracy: 3 }, { label: 'B', energy: '0.125 eV', degeneracy: 5 }])
    await context.close()
  })

  it('two people editing one entry: the later save gets the conflict message and keeps its text until Reload', async () => {
    const client = await as('amara')
    const notebooks = (await client.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
    const infrared = notebooks.find(n => n.name.startsWith('Infrared'))!
    const entry = (await client.post(`/api/notebooks/${infrared.id}/entries`, { title: 'Two windows on one entry' })).body.entry

    const first = await signedInPage('amara')
    const second = await signedInPage('amara')
    for (const { page } of [first, second]) {
      await page.goto(`${baseURL()}/entries/${entry.id}`)
      await page.locator('.ProseMirror').waitFor()
    }
    await first.page.locator('.ProseMirror').click()
    await first.page.keyboard.type('Written in the first window.')
    await waitSaved(first.page)

    await second.page.locator('.ProseMirror').click()
    await second.page.keyboard.type('Written in the second window.')
    const alert = second.page.getByRole('alert').filter({ hasText: 'Someone else changed this entry' })
    await alert.waitFor({ timeout: 15_000 })
    expect(await second.page.locator('.ProseMirror').innerText()).toContain('Written in the second window.')
    await second.page.screenshot({ path: `${ARTIFACTS}/editor-conflict.png`, fullPage: true })

    await alert.getByRole('button', { name: 'Reload' }).click()
    await alert.waitFor({ state: 'detached' })
    await expect.poll(() => second.page.locator('.ProseMirror').innerText()).toContain('Written in the first window.')
    expect(await second.page.locator('.ProseMirror').innerText()).not.toContain('second window')
    await first.context.close()
    await second.context.close()
  })

  it('an entry with 20 blocks: first render, recompute per keystroke and the JavaScript loaded (measured)', async () => {
    const client = await as('amara')
    const notebooks = (await client.get('/api/notebooks')).body.notebooks as { id: string, name: string }[]
    const infrared = notebooks.find(n => n.name.startsWith('Infrared'))!
    const entry = (await client.post(`/api/notebooks/${infrared.id}/entries`, { title: 'Twenty blocks' })).body.entry
    const kinds = listKinds()
    const blocks = Array.from({ length: 20 }, (_, index) => {
      const kind = kinds[index % kinds.length]!
      const hex = index.toString(16).padStart(12, '0')
      return [
        { type: 'paragraph', content: [{ type: 'text', text: `Block ${index + 1}: ${kind.title}.` }] },
        { type: 'calculationBlock', attrs: { blockId: `00000000-0000-4000-8000-${hex}`, kind: kind.kind, title: `${kind.title} ${index + 1}`, input: kind.exampleInput, collapsed: false } },
      ]
    }).flat()
    const saved = await client.patch(`/api/entries/${entry.id}`, { lockVersion: entry.lockVersion, content: { type: 'doc', content: blocks } })
    expect(saved.status).toBe(200)

    const { context, page } = await signedInPage('amara')
    const scripts: { url: string, bytes: number, gzip: number }[] = []
    page.on('response', async (response) => {
      if (!response.url().endsWith('.js')) return
      const body = await response.body().catch(() => null)
      // A chunk both preloaded and imported answers twice: count each file once.
      if (body && !scripts.some(script => script.url === response.url())) scripts.push({ url: response.url(), bytes: body.length, gzip: gzipSync(body, { level: 9 }).length })
    })
    await page.goto(`${baseURL()}/entries/${entry.id}`)
    await page.waitForFunction(() => document.querySelectorAll('.ProseMirror .calc-block').length === 20, undefined, { polling: 'raf', timeout: 30_000 })
    const timing = await page.evaluate(() => {
      const navigation = performance.getEntriesByType('navigation')[0] as PerformanceNavigationTiming
      const paint = performance.getEntriesByName('first-contentful-paint')[0]
      const created = performance.getEntriesByName('thermotome:editor-created')[0]
      const firstRecomputes = performance.getEntriesByName('thermotome:recompute').map(entry => entry.duration)
      return {
        editorReady: performance.now(), firstContentfulPaint: paint?.startTime ?? null, domContentLoaded: navigation.domContentLoadedEventEnd,
        editorCreated: created?.startTime ?? null, firstRecomputeTotal: firstRecomputes.reduce((sum, value) => sum + value, 0), firstRecomputeCount: firstRecomputes.length,
      }
    })
    await page.waitForLoadState('networkidle')

    // Keystrokes in one levels block's temperature, each after the 150 ms debounce.
    const field = page.locator('.ProseMirror [data-kind="levels"]').first().getByLabel('Temperature', { exact: true })
    await field.fill('')
    await page.evaluate(() => performance.clearMeasures('thermotome:recompute'))
    for (const character of '310.5 K') {
      await field.press(character === ' ' ? 'Space' : character)
      await page.waitForTimeout(220)
    }
    const recompute = await page.evaluate(() => performance.getEntriesByName('thermotome:recompute').map(entry => entry.duration))
    expect(recompute.length).toBeGreaterThanOrEqual(6)
    const sorted = [...recompute].sort((a, b) => a - b)
    const median = sorted[Math.floor(sorted.length / 2)]!
    const gzipTotal = scripts.reduce((sum, script) => sum + script.gzip, 0)
    const rawTotal = scripts.reduce((sum, script) => sum + script.bytes, 0)
    const measurements = {
      blocks: 20,
      firstContentfulPaintMs: timing.firstContentfulPaint,
      domContentLoadedMs: timing.domContentLoaded,
      editorWithAllBlocksMs: timing.editorReady,
      editorCreatedMs: timing.editorCreated,
      firstRenderRecompute: { count: timing.firstRecomputeCount, totalMs: timing.firstRecomputeTotal },
      recomputeMs: { count: recompute.length, median, max: sorted[sorted.length - 1], all: recompute.map(value => Number(value.toFixed(2))) },
      javascript: {
        files: scripts.length, bytes: rawTotal, gzipBytes: gzipTotal,
        largest: [...scripts].sort((a, b) => b.gzip - a.gzip).slice(0, 5).map(script => ({ file: script.url.split('/').pop(), bytes: script.bytes, gzipBytes: script.gzip })),
      },
    }
    writeFileSync(`${ARTIFACTS}/editor-measurements.json`, `${JSON.stringify(measurements, null, 2)}\n`)
    console.log('entry page measurements', JSON.stringify(measurements))
    await page.screenshot({ path: `${ARTIFACTS}/editor-twenty-blocks.png` })
    expect(median).toBeLessThan(16)
    expect(scripts.length).toBeGreaterThan(0)
    await context.close()
  })
})
