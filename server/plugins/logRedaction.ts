// The 'error' hook runs (synchronously) before Nitro's error handler logs an unhandled error:
// query parameters are withheld there (server/utils/logRedaction.ts).
export default defineNitroPlugin((nitroApp) => {
  nitroApp.hooks.hook('error', (error) => {
    redactQueryParameters(error)
  })
})
