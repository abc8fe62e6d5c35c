// The life of an entry: its states, the transitions between them, and who may take each one.
// Pure and shared: the server's routes, `signing.get` (`can`) and the page all ask mayDo, so
// the rules live here once (DESIGN.md "One owner per rule").
//
// A state is never stored: it is derived from what the frozen tables hold (is the current
// version frozen, does it carry a countersignature, did its witness decline), so an edited
// status column cannot make an entry look witnessed anywhere.

/** The status of any one version: an older version than the current one is superseded. */
export const VERSION_STATUSES = ['draft', 'awaiting_witness', 'witnessed', 'declined', 'superseded'] as const
export type VersionStatus = (typeof VERSION_STATUSES)[number]
/** The state of an entry's current version. */
export type EntryState = Exclude<VersionStatus, 'superseded'>

/** What the stored rows say about the entry's current version. */
export interface VersionFacts {
  /** An author signature froze the current version (a row in entry_versions). */
  frozen: boolean
  /** The frozen version carries a witness's countersignature. */
  countersigned: boolean
  /** The asked witness declined the frozen version. */
  declined: boolean
}

/**
 * The state of the current version from its facts. A countersignature wins over a decline:
 * a signature is evidence, a decline only a request's outcome.
 */
export function entryStateOf(facts: VersionFacts): EntryState {
  if (!facts.frozen) return 'draft'
  if (facts.countersigned) return 'witnessed'
  if (facts.declined) return 'declined'
  return 'awaiting_witness'
}

/** The status of version `version` of an entry whose current version is `current` in `state`. */
export function versionStatusOf(version: number, current: { version: number, state: EntryState }): VersionStatus {
  return version < current.version ? 'superseded' : current.state
}

export type LifecycleAction = 'edit' | 'sign' | 'requestWitness' | 'countersign' | 'decline' | 'amend'
export const LIFECYCLE_ACTIONS: readonly LifecycleAction[] = ['edit', 'sign', 'requestWitness', 'countersign', 'decline', 'amend']

/** The person asking, as far as the lifecycle cares. */
export interface LifecyclePerson {
  id: string
  roles: readonly string[]
}

/** The entry, with the facts about this person that the rules need. */
export interface LifecycleEntry {
  authorId: string
  state: EntryState
  /** The person belongs to the entry's notebook. */
  personIsMember: boolean
  /** The author asked this person to witness the current version, and the request is open. */
  personAskedToWitness: boolean
}

export type Permission =
  | { allowed: true }
  | { allowed: false, status: 403 | 409, reason: string }

const allow: Permission = { allowed: true }
const refuse = (status: 403 | 409, reason: string): Permission => ({ allowed: false, status, reason })

/**
 * Whether `person` may take `action` on `entry` now: allowed, or the HTTP status and the
 * reason in words (403: not for this person; 409: not in this state). Reading rights are
 * decided before this (a person who cannot read the entry gets 404 from the server).
 */
export function mayDo(action: LifecycleAction, person: LifecyclePerson, entry: LifecycleEntry): Permission {
  const isAuthor = entry.authorId === person.id
  const has = (role: string) => person.roles.includes(role)
  switch (action) {
    case 'edit':
      if (!has('scientist')) return refuse(403, 'Editing an entry needs the scientist role.')
      if (!isAuthor) return refuse(403, 'Only the author edits an entry.')
      if (entry.state !== 'draft') return refuse(409, 'This version is signed and locked. Amend it to make changes.')
      return allow
    case 'sign':
      if (!has('scientist')) return refuse(403, 'Signing an entry needs the scientist role.')
      if (!isAuthor) return refuse(403, 'Only the author signs an entry.')
      if (entry.state !== 'draft') return refuse(409, 'This version is already signed. Amend it to sign a new version.')
      return allow
    case 'requestWitness':
      if (!has('scientist')) return refuse(403, 'Asking for a witness needs the scientist role.')
      if (!isAuthor) return refuse(403, 'Only the author asks for a witness.')
      if (entry.state !== 'awaiting_witness') return refuse(409, 'Only a signed version waiting for its witness can be sent to a witness.')
      return allow
    case 'countersign':
    case 'decline': {
      const verb = action === 'countersign' ? 'Countersigning' : 'Declining'
      if (!has('witness')) return refuse(403, `${verb} needs the witness role.`)
      if (isAuthor) return refuse(403, 'Nobody witnesses their own entry.')
      if (!entry.personIsMember) return refuse(403, 'Only a witness who belongs to this notebook decides on its entries.')
      if (entry.state !== 'awaiting_witness') return refuse(409, 'This version is no longer waiting for a witness.')
      if (!entry.personAskedToWitness) return refuse(403, 'The author has not asked you to witness this version.')
      return allow
    }
    case 'amend':
      if (!has('scientist')) return refuse(403, 'Amending an entry needs the scientist role.')
      if (!isAuthor) return refuse(403, 'Only the author amends an entry.')
      if (entry.state === 'draft') return refuse(409, 'Only a signed version is amended; a draft is simply edited.')
      return allow
  }
}

/** Every action and whether it is open to this person now: what the page shows as buttons. */
export function openActions(person: LifecyclePerson, entry: LifecycleEntry): Record<LifecycleAction, boolean> {
  return Object.fromEntries(LIFECYCLE_ACTIONS.map(action => [action, mayDo(action, person, entry).allowed])) as Record<LifecycleAction, boolean>
}
