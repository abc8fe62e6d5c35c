import { resolve } from 'node:path'
import fsDriver from 'unstorage/drivers/fs'

/** Bulk export files live under THERMOTOME_DATA_DIR/exports (a bucket driver can replace this mount in production). */
export default defineNitroPlugin(() => {
  const base = resolve(process.env.THERMOTOME_DATA_DIR ?? '.data', 'exports')
  useStorage().mount('exports', fsDriver({ base }))
})
