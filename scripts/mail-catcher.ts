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

/** RFC 2047 encoded words (=?UTF-8?Q?...?= and =?UTF-8?B?...?=) in a header. */
function decodeHeader(value: string): string {
  return value.replace(/\?=\s+=\?/g, '?==?').replace(/=\?([^?]+)\?([QqBb])\?([^?]*)\?=/g, (_all, charset: string, encoding: string, text: string) => {
    const bytes = encoding.toUpperCase() === 'B'
      ? Buffer.from(text, 'base64')
      : Buffer.from(text.replace(/_/g, ' ').replace(/=([0-9A-Fa-f]{2})/g, (_m, hex: string) => String.fromCharCode(Number.parseInt(hex, 16))), 'latin1')
    return new TextDecoder(charset.toLowerCase() === 'utf-8' ? 'utf-8' : charset).decode(bytes)
  })
}

/** Quoted-printable (RFC 2045 §6.7) to bytes. */
function decodeQuotedPrintable(text: string): Buffer {
  const binary = text.replace(/=\r?\n/g, '').replace(/=([0-9A-Fa-f]{2})/g, (_m, hex: string) => String.fromCharCode(Number.parseInt(hex, 16)))
  return Buffer.from(binary, 'latin1')
}

/** A single-part text message as nodemailer writes it: headers, blank line, encoded body. */
function parseMessage(raw: Buffer) {
  const source = raw.toString('latin1')
  const split = source.search(/\r?\n\r?\n/)
  const head = split >= 0 ? source.slice(0, split) : source
  const body = split >= 0 ? source.slice(split).replace(/^\r?\n\r?\n/, '') : ''
  const headers = new Map<string, string>()
  for (const line of head.replace(/\r?\n[ \t]+/g, ' ').split(/\r?\n/)) {
    const colon = line.indexOf(':')
    if (colon > 0) headers.set(line.slice(0, colon).trim().toLowerCase(), line.slice(colon + 1).trim())
  }
  const encoding = (headers.get('content-transfer-encoding') ?? '7bit').toLowerCase()
  const bytes = encoding === 'base64'
    ? Buffer.from(body.replace(/\s+/g, ''), 'base64')
    : encoding === 'quoted-printable' ? decodeQuotedPrintable(body) : Buffer.from(body, 'latin1')
  return {
    subject: decodeHeader(headers.get('subject') ?? ''),
    text: new TextDecoder('utf-8').decode(bytes).replace(/\r\n/g, '\n'),
    headerFrom: decodeHeader(headers.get('from') ?? ''),
    headerTo: decodeHeader(headers.get('to') ?? ''),
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
    stream.on('end', () => {
      if ((stream as unknown as { sizeExceeded?: boolean }).sizeExceeded)
        return callback(Object.assign(new Error('Message too large for the mail catcher'), { responseCode: 552 }))
      const receivedAt = new Date()
      const parsed = parseMessage(Buffer.concat(chunks))
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
