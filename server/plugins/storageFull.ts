/**
 * When the disk holding uploaded files (or exports) is full, answer 507 Insufficient Storage
 * with words a person can act on instead of a bare 500. Routes remove what they half-wrote.
 */
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('error', (error, { event }) => {
    if (!event || !isStorageFull(error))
      return
    const h3Error = error as { statusCode?: number, statusMessage?: string, message: string, unhandled?: boolean }
    h3Error.statusCode = 507
    h3Error.statusMessage = 'Insufficient Storage'
    h3Error.message = 'The file store is full, so the file was not saved and nothing was recorded. Ask an administrator to free space, then try again.'
    h3Error.unhandled = false
  })
})
