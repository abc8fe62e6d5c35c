import { readdir, readFile } from 'node:fs/promises'
import { join, resolve } from 'node:path'

/**
 * Messages kept by the local mail catcher (scripts/mail-catcher.ts), newest first. Exists only
 * in local mode, THERMOTOME_MAIL_CATCHER=1; otherwise this route is not there (404).
 */
export default defineEventHandler(async (event) => {
  if (process.env.THERMOTOME_MAIL_CATCHER !== '1')
    throw createError({ statusCode: 404, message: 'Page not found.' })
  await requireRole(event, 'admin')
  const folder = join(resolve(process.env.THERMOTOME_DATA_DIR ?? '.data'), 'mail')
  const names = (await readdir(folder).catch(() => [] as string[])).filter(name => /^\d+-[0-9a-f]+\.json$/.test(name)).sort().reverse().slice(0, 200)
  const messages = []
  for (const name of names) {
    try {
      const message = JSON.parse(await readFile(join(folder, name), 'utf8')) as { from: string, to: string[], subject: string, text: string, receivedAt: string }
      messages.push({ id: name.replace(/\.json$/, ''), from: message.from, to: message.to, subject: message.subject, text: message.text, receivedAt: message.receivedAt })
    }
    catch { /* a file being written or not ours */ }
  }
  return { messages }
})
