import { parseEmbedOrigins } from '#shared/embed'
import { createHash } from 'node:crypto'

/** Origins allowed to frame the embed pages (NUXT_PUBLIC_EMBED_ORIGINS, space or comma separated). */
export function embedOrigins(): string[] {
  return parseEmbedOrigins(String(useRuntimeConfig().public.embedOrigins ?? ''))
}

export function isEmbedPath(path: string): boolean {
  return path === '/embed' || path.startsWith('/embed/')
}

/** SHA-256 source expressions for inline scripts, so CSP can forbid every other inline script. */
export function inlineScriptHashes(htmlParts: string[]): string[] {
  const hashes = new Set<string>()
  for (const part of htmlParts) {
    for (const match of part.matchAll(/<script(?![^>]*\bsrc=)(?![^>]*type="application\/json")[^>]*>([\s\S]*?)<\/script>/g))
      hashes.add(`'sha256-${createHash('sha256').update(match[1]!, 'utf8').digest('base64')}'`)
  }
  return [...hashes]
}

export function contentSecurityPolicy(path: string, scriptHashes: string[]): string {
  const frameAncestors = isEmbedPath(path) ? ["'self'", ...embedOrigins()].join(' ') : "'none'"
  return [
    "default-src 'self'",
    `script-src 'self' ${scriptHashes.join(' ')}`.trim(),
    // The editor and Vue transitions set style attributes; no style from another origin.
    "style-src 'self' 'unsafe-inline'",
    "img-src 'self' data: blob:",
    "font-src 'self'",
    "connect-src 'self'",
    "object-src 'none'",
    "base-uri 'self'",
    "form-action 'self'",
    `frame-ancestors ${frameAncestors}`,
  ].join('; ')
}
