import {
  WrongPassphraseError,
  openSealedKey,
  signStatement,
} from '#shared/records'
import type { RecordDocument, SealedKey, SignatureEnvelope, SigningStatement } from '#shared/records'

/** A signing challenge as POST /api/entries/:id/challenge answers it. */
export interface SigningChallengeReply {
  meaning: 'authored' | 'witnessed'
  version: number
  record: RecordDocument
  recordHash: string
  nonce: string
  issuedAt: string
  expiresAt: string
  statementText: string
  signer: { id: string, name: string, email: string }
  keyFingerprint: string
  countersigns?: string
}

/** The message of a failed $fetch, in the server's words when it sent some. */
export function signingErrorMessage(caught: unknown, fallback = 'That did not work.'): string {
  const data = (caught as { data?: { message?: string } }).data
  return data?.message ?? (caught instanceof Error ? caught.message : fallback)
}

export function signingStatusOf(caught: unknown): number | undefined {
  return (caught as { statusCode?: number, status?: number }).statusCode ?? (caught as { status?: number }).status
}

/**
 * Unseals the signing key with the passphrase typed now, signs the statement built from the
 * challenge, and forgets the open key. Throws WrongPassphraseError before anything is sent.
 */
export async function signingSignChallenge(challenge: SigningChallengeReply, sealed: SealedKey, passphrase: string): Promise<SignatureEnvelope> {
  const secretKey = await openSealedKey(sealed, passphrase)
  try {
    const statement: SigningStatement = {
      schema: 'thermotome.statement/1',
      recordHash: challenge.recordHash,
      signer: challenge.signer,
      keyFingerprint: challenge.keyFingerprint,
      meaning: challenge.meaning,
      statement: challenge.statementText,
      signedAt: challenge.issuedAt,
      challenge: challenge.nonce,
      ...(challenge.countersigns ? { countersigns: challenge.countersigns } : {}),
    }
    return await signStatement(statement, secretKey)
  }
  finally {
    secretKey.fill(0)
  }
}

export { WrongPassphraseError }

/** A rough passphrase strength in words: length counts most; a hint, not a rule. */
export function signingPassphraseStrength(passphrase: string): { score: 0 | 1 | 2 | 3, words: string } {
  const length = [...passphrase].length
  const classes = [/[a-z]/, /[A-Z]/, /[0-9]/, /[^A-Za-z0-9]/].filter(pattern => pattern.test(passphrase)).length
  const spaces = (passphrase.match(/\s+/g) ?? []).length
  if (length < 12) return { score: 0, words: 'Too short: use at least 12 characters, a few words is easiest.' }
  if (length >= 20 && (spaces >= 3 || classes >= 3)) return { score: 3, words: 'Strong.' }
  if (length >= 16 || classes >= 3) return { score: 2, words: 'Fair: a longer phrase of unrelated words is stronger.' }
  return { score: 1, words: 'Weak: add words, or mix in digits and symbols.' }
}
