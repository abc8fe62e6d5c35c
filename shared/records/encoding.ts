// Byte encodings that work the same in the browser and in Node 20 (no Buffer).

const BASE64_PATTERN = /^(?:[A-Za-z0-9+/]{4})*(?:[A-Za-z0-9+/]{2}==|[A-Za-z0-9+/]{3}=)?$/
const HEX_PATTERN = /^(?:[0-9a-fA-F]{2})*$/

/** UTF-8 bytes of a string (WHATWG Encoding Standard, TextEncoder). */
export function utf8Bytes(text: string): Uint8Array<ArrayBuffer> {
  return new TextEncoder().encode(text)
}

/** Standard base64 with padding (RFC 4648 §4). */
export function bytesToBase64(bytes: Uint8Array): string {
  // String.fromCharCode on chunks: one call per byte would be slow for keys of MBs,
  // one call for everything overflows the argument limit.
  let binary = ''
  const chunk = 0x8000
  for (let start = 0; start < bytes.length; start += chunk) {
    binary += String.fromCharCode(...bytes.subarray(start, start + chunk))
  }
  return btoa(binary)
}

/**
 * Decodes standard, padded base64 (RFC 4648 §4). Throws on anything else — whitespace,
 * the URL-safe alphabet, missing padding — because a signed artefact has exactly one spelling.
 */
export function base64ToBytes(base64: string): Uint8Array<ArrayBuffer> {
  if (!BASE64_PATTERN.test(base64)) {
    throw new Error('not standard padded base64 (RFC 4648 §4)')
  }
  const binary = atob(base64)
  const bytes = new Uint8Array(binary.length)
  for (let index = 0; index < binary.length; index++) bytes[index] = binary.charCodeAt(index)
  // The pattern admits non-zero unused bits in the last character ("QR==" and "QQ==" both
  // decode to "A"); accept only the canonical spelling.
  if (bytesToBase64(bytes) !== base64) {
    throw new Error('not canonical base64: the last character carries stray bits')
  }
  return bytes
}

/** Lower-case hexadecimal. */
export function bytesToHex(bytes: Uint8Array): string {
  let hex = ''
  for (const byte of bytes) hex += byte.toString(16).padStart(2, '0')
  return hex
}

/** Decodes hexadecimal of either case; throws on odd length or other characters. */
export function hexToBytes(hex: string): Uint8Array<ArrayBuffer> {
  if (!HEX_PATTERN.test(hex)) throw new Error('not hexadecimal with an even number of digits')
  const bytes = new Uint8Array(hex.length / 2)
  for (let index = 0; index < bytes.length; index++) {
    bytes[index] = Number.parseInt(hex.slice(index * 2, index * 2 + 2), 16)
  }
  return bytes
}

/** Constant-time comparison, so a verifier does not leak how much of a key matched. */
export function bytesEqual(left: Uint8Array, right: Uint8Array): boolean {
  if (left.length !== right.length) return false
  let difference = 0
  for (let index = 0; index < left.length; index++) difference |= left[index]! ^ right[index]!
  return difference === 0
}
