import { z } from 'zod'
import { SealedKeySchema, SignatureEnvelopeSchema } from '../records/schema'

/**
 * What a signer declares, in our own words. The text is part of the signed statement, so the
 * server accepts exactly these texts on arrival (older signatures keep the text they signed).
 * Both name the record tolerance (shared/records/recheck.ts, RECORD_TOLERANCE).
 */
export const STATEMENT_TEXTS = {
  authored: 'I wrote this record. To the best of my knowledge it is accurate and complete. Its calculation results are the server\'s, which my browser recomputed and found equal within a relative 1e-9 (values near zero within 1e-12 of the largest value of the same quantity in the block).',
  witnessed: 'I have read this record and I understand it. Its calculation results are the server\'s, which my browser recomputed and compared within a relative 1e-9 (values near zero within 1e-12 of the largest value of the same quantity in the block).',
} as const
export type SigningRouteMeaning = keyof typeof STATEMENT_TEXTS

/** Minutes a signing challenge stays valid after the server issues it. */
export const CHALLENGE_MINUTES = 5

/** Why a key is retired when a new one replaces it. */
export const KEY_RETIREMENT_REASONS = {
  rotated: 'rotated',
  forgotten: 'replaced: forgotten passphrase',
} as const

export const challengeBodySchema = z.object({
  meaning: z.enum(['authored', 'witnessed'], { error: 'expected authored or witnessed' }),
})

export const signBodySchema = z.object({
  envelope: SignatureEnvelopeSchema,
  /**
   * A witness who countersigns although the browser's recomputation differs from the record
   * beyond the record tolerance says so: the differences as shown, kept in the audit event.
   */
  acknowledgedDifferences: z.array(z.string().max(2000, 'at most 2000 characters'), { error: 'expected a list of texts' }).max(100, 'at most 100 differences').optional(),
})

export const registerKeyBodySchema = z.object({
  /** Raw 32-byte Ed25519 public key, base64. */
  publicKey: z.string({ error: 'expected the public key in base64' }).max(100),
  sealedSecretKey: SealedKeySchema,
  /** The account password, asked again: a stolen session must not be able to make a signing key. */
  password: z.string({ error: 'expected your account password' }).min(1, 'your account password is needed').max(512, 'at most 512 characters'),
  /** Needed when an active key exists: why it is being retired. */
  replaces: z.enum(['rotated', 'forgotten'], { error: 'expected rotated or forgotten' }).optional(),
})

export const witnessRequestBodySchema = z.object({
  witnessId: z.uuid({ error: 'expected a person id (UUID)' }),
})

export const declineBodySchema = z.object({
  reason: z.string({ error: 'expected a reason' }).trim().min(3, 'say why, in a few words at least').max(2000, 'at most 2000 characters'),
})

export const versionQuerySchema = z.object({
  version: z.coerce.number({ error: 'expected a version number' }).int('expected a whole version number').min(1, 'versions start at 1').max(1_000_000).optional(),
})

/** The word for a signature's meaning, shown to people. */
export const MEANING_WORDS: Record<string, string> = {
  authored: 'Signed by the author',
  witnessed: 'Countersigned by the witness',
  reviewed: 'Reviewed',
}

/** A records officer confirming a waiting signing key: why they are sure it is the person's. */
export const confirmKeyBodySchema = z.object({
  reason: z.string({ error: 'expected a reason' }).trim().min(10, 'say how you know this key is theirs (at least 10 characters)').max(1000, 'at most 1000 characters'),
})
