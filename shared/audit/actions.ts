/**
 * Plain words for the actions in the audit trail. The stored action stays a stable code (it is
 * what filters, the CSV export and integrators use); people read these words beside it in the
 * entry's history, on the audit page and in the record PDF.
 */
export const AUDIT_ACTION_WORDS: Readonly<Record<string, string>> = {
  entry_created: 'Entry started',
  entry_saved: 'Saved',
  entry_edited: 'Edited',
  entry_signed: 'Signed by the author',
  witness_requested: 'Witness requested',
  entry_witnessed: 'Countersigned',
  entry_declined: 'Witness declined',
  entry_amended: 'Amended: new draft version',
  attachment_added: 'Data file attached',
  attachment_removed: 'Data file removed',
  attachment_integrity_failed: 'Data file failed its checksum',
  record_exported: 'Record PDF exported',
  record_bundle_downloaded: 'Record bundle downloaded',
  record_verified: 'Record verified',
  records_searched: 'Records searched',
  mail_failed: 'E-mail could not be sent',
  sign_in: 'Signed in',
  sign_in_failed: 'Sign-in refused',
  sign_out: 'Signed out',
  signing_key_registered: 'Signing key registered',
  signing_key_retired: 'Signing key retired',
  signing_key_confirmed: 'Signing key confirmed by a records officer',
  person_created: 'Person added',
  person_renamed: 'Person renamed',
  person_disabled: 'Person disabled',
  person_enabled: 'Person enabled again',
  roles_changed: 'Roles changed',
  password_set: 'Password set',
  password_reset_sent: 'Password link mailed',
  password_set_by_link: 'Password set with a mailed link',
  password_changed: 'Password changed',
  notebook_created: 'Notebook created',
  notebook_members_changed: 'Notebook members changed',
  export_requested: 'Bulk export requested',
  export_completed: 'Bulk export finished',
  export_cancelled: 'Bulk export cancelled',
  export_downloaded: 'Bulk export downloaded',
  export_expired: 'Bulk export files removed',
  audit_exported: 'Audit trail exported',
  api_token_issued: 'API token issued',
  api_token_revoked: 'API token revoked',
  demo_lab_seeded: 'Demo lab created',
}

/** The words for an action; an action without words reads as its code with spaces. */
export function auditActionWords(action: string): string {
  const words = AUDIT_ACTION_WORDS[action]
  if (words) return words
  const spaced = action.replace(/_/g, ' ')
  return spaced.charAt(0).toUpperCase() + spaced.slice(1)
}
