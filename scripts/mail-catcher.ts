/**
 * Local mail catcher: an SMTP server on loopback that keeps every message it receives as a JSON
 * file in `${THERMOTOME_DATA_DIR}/mail/` ({ from, to, subject, text, receivedAt }), for the
 * admin page /admin/mail and the tests. Never for production: no TLS, no authentication.
 *
 *   THERMOTOME_DATA_DIR=.data npx tsx scripts/mail-catcher.ts [--port 2525] [--host 127.0.0.1]
 *
 * Prints one line "mail catcher listening on smtp://HOST:PORT" once it accepts mail
 * (--port 0 picks a free port). Point the app at it with THERMOTOME_SMTP_URL=smtp://HOST:PORT.
 */
import { randomBytes } from 'node:crypto'
import { mkdirSync, renameSync, writeFileSync } from 'node:fs'
import { join, resolve } from 'node:path'
import { simpleParser } from 'mailparser'
import { SMTPServer } from 'smtp-server'

function option(name: string, fallback: string): string {
  const index = process.argv.indexOf(`--${name}`)
  return index >= 0 && process.argv[index + 1] ? process.argv[index + 1]! : fallback
}

const host = option('host', '127.0.0.1')
const port = Number(option('port', process.env.THERMOTOME_MAIL_PORT ?? '2525'))
const folder = join(resolve(process.env.THERMOTOME_DATA_DIR ?? '.data'), 'mail')
mkdirSync(folder, { recursive: true })
const MAX_BYTES = 1024 * 1024

/** The parts of a message the admin page and the tests read, decoded by mailparser (MIME, RFC 2045–2047). */
async function parseMessage(raw: Buffer) {
  const mail = await simpleParser(raw, { skipHtmlToText: true, skipTextToHtml: true, skipImageLinks: true })
  return {
    subject: mail.subject ?? '',
    text: (mail.text ?? '').replace(/\r\n/g, '\n'),
    headerFrom: mail.from?.text ?? '',
    headerTo: (Array.isArray(mail.to) ? mail.to.map(address => address.text).join(', ') : mail.to?.text) ?? '',
  }
}

const server = new SMTPServer({
  authOptional: true,
  disabledCommands: ['STARTTLS', 'AUTH'],
  size: MAX_BYTES,
  banner: 'Thermotome local mail catcher',
  onData(stream, session, callback) {
    const chunks: Buffer[] = []
    stream.on('data', (chunk: Buffer) => chunks.push(chunk))
    stream.on('end', async () => {
      if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded)
        return callback(Object.assign(new Error('Message too large for the mail catcher'), { responseCode: 552 }))
      const receivedAt = new Date()
      let parsed: Awaited<ReturnType<typeof parseMessage>>
      try {
        parsed = await parseMessage(Buffer.concat(chunks))
      }
      catch (error) {
        return callback(Object.assign(new Error(`The mail catcher could not read the message: ${(error as Error).message}`), { responseCode: 554 }))
      }
      const message = {
        from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
        to: session.envelope.rcptTo.map(recipient => recipient.address),
        subject: parsed.subject,
        text: parsed.text,
        receivedAt: receivedAt.toISOString(),
        headerFrom: parsed.headerFrom,
        headerTo: parsed.headerTo,
      }
      const name = `${receivedAt.getTime()}-${randomBytes(4).toString('hex')}.json`
      // Written under a temporary name and renamed, so a reader never sees half a file.
      writeFileSync(join(folder, `.${name}.tmp`), JSON.stringify(message, null, 2))
      renameSync(join(folder, `.${name}.tmp`), join(folder, name))
      callback()
    })
  },
})

server.on('error', error => console.error('[mail catcher]', error.message))
server.listen(port, host, () => {
  const address = server.server.address()
  const actualPort = typeof address === 'object' && address ? address.port : port
  console.log(`mail catcher listening on smtp://${host}:${actualPort}`)
})

for (const signal of ['SIGINT', 'SIGTERM'] as const)
  process.on(signal, () => server.close(() => process.exit(0)))
