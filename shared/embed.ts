/**
 * Embed mode: the messages an embedded Thermotome page posts to its host window, and the
 * parsing of the allowed host origins. Hosts listen with
 *   window.addEventListener('message', e => { if (e.origin === THERMOTOME_ORIGIN && e.data?.source === 'thermotome') … })
 */
export const EMBED_EVENTS = ['ready', 'entry-created', 'entry-saved', 'entry-signed', 'entry-witnessed', 'height-changed'] as const
export type EmbedEventName = (typeof EMBED_EVENTS)[number]

export interface EmbedMessage {
  source: 'thermotome'
  /** The message format; bumped only for incompatible changes. */
  protocol: 1
  event: EmbedEventName
  entryId?: string
  /** entry-saved: the entry's new lock version. */
  lockVersion?: number
  /** entry-signed, entry-witnessed: the signed record version. */
  recordVersion?: number
  /** height-changed: the document height in CSS pixels. */
  height?: number
}

/** Keep only well-formed http(s) origins (scheme, host and port; no path). */
export function parseEmbedOrigins(text: string): string[] {
  return text.split(/[\s,]+/).filter(Boolean).filter(origin => /^https?:\/\/[^/\s'";]+$/.test(origin))
}
