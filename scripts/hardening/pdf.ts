/** Markup in a signed record's PDF shows as literal text (pdftotext). Needs signing and pdf. */
import { execFile } from 'node:child_process'
import { existsSync, mkdirSync, writeFileSync } from 'node:fs'
import { join } from 'node:path'
import { promisify } from 'node:util'
import { check, skip } from './checks'
import { ARTIFACTS, ROOT } from './env'
import type { Fixtures } from './routes'
import { MARKUP } from './web'

const run = promisify(execFile)
const NAME = 'markup shows as literal text in the record PDF (pdftotext)'

/** Register a fresh key for amara and sign the entry; returns true when signed. */
export async function signAsAmara(f: Fixtures, entryId: string): Promise<boolean> {
  const records = await import('../../shared/records/index')
  const { DEMO_PASSWORD } = await import('../../shared/demo')
  const amara = f.clients.amara
  const pair = records.generateSigningKeyPair()
  const sealedSecretKey = await records.sealSecretKey(pair.secretKey, 'hardening pdf passphrase')
  const current = await amara.get('/api/keys')
  const registered = await amara.post('/api/keys', { publicKey: Buffer.from(pair.publicKey).toString('base64'), sealedSecretKey, password: DEMO_PASSWORD, ...(current.body?.active ? { replaces: 'rotated' } : {}) })
  if (registered.status !== 201) return false
  // A replacement key signs only once a records officer has confirmed it.
  if (registered.body?.key?.pending)
    await f.clients.felix.post(`/api/keys/${registered.body.key.id}/confirm`, { reason: 'Hardening run: confirmed by the records officer.' })
  const challenge = await amara.post(`/api/entries/${entryId}/challenge`, { meaning: 'authored' })
  if (challenge.status !== 200) return false
  const c = challenge.body
  const envelope = await records.signStatement({ schema: 'thermotome.statement/1', recordHash: c.recordHash, signer: c.signer, keyFingerprint: c.keyFingerprint, meaning: 'authored', statement: c.statementText, signedAt: c.issuedAt, challenge: c.nonce } as never, pair.secretKey)
  return (await amara.post(`/api/entries/${entryId}/sign`, { envelope })).status === 201
}

export async function pdfShowsMarkup(f: Fixtures, entryId: string | undefined) {
  if (!existsSync(join(ROOT, 'server/api/records/[id]/pdf.get.ts'))) {
    skip('hostile', NAME, 'PDF route (branch pdf) is not in this build yet')
    return
  }
  if (!existsSync(join(ROOT, 'server/api/entries/[id]/sign.post.ts'))) {
    skip('hostile', NAME, 'a PDF needs a signed record: signing routes (branch signing) are not in this build yet')
    return
  }
  if (!entryId) { skip('hostile', NAME, 'the markup entry could not be made'); return }
  if (!check('hostile', 'the entry with markup can be signed (for its PDF)', await signAsAmara(f, entryId)))
    return
  const response = await fetch(`${f.baseURL}/api/records/${entryId}/pdf`, { headers: { cookie: f.clients.felix.cookie, 'x-forwarded-for': f.clients.felix.address } })
  const bytes = Buffer.from(await response.arrayBuffer())
  if (!check('hostile', 'the record PDF of the markup entry is served', response.status === 200 && bytes.subarray(0, 5).toString() === '%PDF-', `status ${response.status}`))
    return
  const dir = `${ARTIFACTS}/hardening`
  mkdirSync(dir, { recursive: true })
  writeFileSync(`${dir}/markup-record.pdf`, bytes)
  const { stdout } = await run('pdftotext', ['-layout', `${dir}/markup-record.pdf`, '-'])
  const flat = stdout.replace(/\s+/g, ' ')
  const wanted = [MARKUP.title, MARKUP.text.split(' & ')[0]!, MARKUP.label, MARKUP.blockTitle]
  const missing = wanted.filter(w => !flat.includes(w))
  check('hostile', NAME, missing.length === 0, missing.length ? `not found literally: ${missing.join(' | ')} (test-artifacts/hardening/markup-record.pdf)` : 'title, text, block title and level label all literal')
}
