import { defineStore } from 'pinia'
import { editorDocumentIssues, storageIssues } from '#shared/editor/validate'

/** What the page says about saving, in words. */
export type SaveStatus = 'saved' | 'unsaved' | 'saving' | 'invalid' | 'conflict' | 'failed'

/** How long typing must pause before the entry is saved. */
export const AUTOSAVE_DELAY_MS = 1000

/**
 * The open entry's editor state: its lock version, whether local changes wait to be saved,
 * and a conflict when someone else saved first. The server stays the one source of truth.
 */
export const useEntryStore = defineStore('entry', {
  state: () => ({
    entryId: null as string | null,
    lockVersion: 0,
    title: '',
    content: null as Record<string, unknown> | null,
    /** Local changes not yet stored. */
    dirty: false,
    saving: false,
    /** Set when a save answered 409: the local text is kept until the person reloads. */
    conflict: null as string | null,
    /** Why the local document cannot be stored yet (its shape, or no title), if so. */
    invalidReason: null as string | null,
    /** Blocks whose input does not compute yet: stored as they are, refused only at signing. */
    incompleteBlocks: [] as string[],
    /** A save failed for another reason (network, server). */
    failure: null as string | null,
    lastSavedAt: null as Date | null,
    /** A block just inserted: its view moves focus into its first field. */
    focusBlockId: null as string | null,
    /** After a block moved, the control to focus again in its new place. */
    focusAfterMove: null as { blockId: string, control: 'up' | 'down' } | null,
  }),
  getters: {
    status(state): SaveStatus {
      if (state.conflict) return 'conflict'
      if (state.saving) return 'saving'
      if (state.invalidReason && state.dirty) return 'invalid'
      if (state.failure) return 'failed'
      return state.dirty ? 'unsaved' : 'saved'
    },
  },
  actions: {
    open(entry: { id: string, lockVersion: number, title: string, content: unknown }) {
      this.$reset()
      this.entryId = entry.id
      this.lockVersion = entry.lockVersion
      this.title = entry.title
      this.content = entry.content as Record<string, unknown>
    },
    /** Records a local change and schedules the autosave. */
    change(patch: { content?: Record<string, unknown>, title?: string }) {
      if (patch.content) this.content = patch.content
      if (patch.title !== undefined) this.title = patch.title
      this.dirty = true
      this.failure = null
      scheduleSave(this)
    },
    /** Saves now if there is something to save and nothing stands in the way. */
    async save(): Promise<boolean> {
      cancelScheduledSave()
      if (!this.dirty || !this.entryId || this.conflict) return !this.dirty
      if (this.saving) {
        scheduleSave(this)
        return false
      }
      const all = this.content ? editorDocumentIssues(this.content, 200) : []
      this.incompleteBlocks = [...new Set(all.filter(issue => issue.incomplete).map(issue => issue.message))]
      const issues = storageIssues(all)
      if (!this.title.trim()) issues.unshift({ path: 'title', message: 'the entry needs a title' })
      if (issues.length > 0) {
        this.invalidReason = issues[0]!.message
        return false
      }
      this.invalidReason = null
      this.saving = true
      const sent = { content: this.content, title: this.title.trim() }
      this.dirty = false
      try {
        const { entry } = await $fetch<{ entry: { lockVersion: number } }>(`/api/entries/${this.entryId}`, {
          method: 'PATCH',
          body: { lockVersion: this.lockVersion, ...sent },
        })
        this.lockVersion = entry.lockVersion
        this.lastSavedAt = new Date()
        return true
      }
      catch (error) {
        this.dirty = true
        const reply = error as { statusCode?: number, data?: { message?: string } }
        if (reply.statusCode === 409) this.conflict = reply.data?.message ?? 'Someone else changed this entry.'
        else this.failure = reply.data?.message ?? 'The entry could not be saved. It will be tried again.'
        if (reply.statusCode !== 409 && reply.statusCode !== 400 && reply.statusCode !== 403) scheduleSave(this, 5000)
        return false
      }
      finally {
        this.saving = false
        if (this.dirty && !this.conflict && !this.failure) scheduleSave(this)
      }
    },
    /** Forgets local changes (after the person chose to reload someone else's version). */
    discard() {
      cancelScheduledSave()
      this.dirty = false
      this.conflict = null
    },
  },
})

// One timer for the one open entry; only ever set in the browser (changes come from the editor).
let timer: ReturnType<typeof setTimeout> | null = null
function scheduleSave(store: { save: () => Promise<boolean> }, delay = AUTOSAVE_DELAY_MS) {
  cancelScheduledSave()
  timer = setTimeout(() => { timer = null; void store.save() }, delay)
}
function cancelScheduledSave() {
  if (timer) clearTimeout(timer)
  timer = null
}
