import { resolve } from 'node:path'
import type { Driver } from 'unstorage'
import fsDriver from 'unstorage/drivers/fs'

/**
 * A driver that loads the S3 driver on first use. Nitro does not wait for async plugins, so
 * the mount itself must happen at once; and the s3 driver (with its aws4fetch dependency) is
 * only loaded when a bucket is configured.
 */
function lazyS3Driver(options: { bucket: string, endpoint: string, region: string, accessKeyId: string, secretAccessKey: string }): Driver {
  let loaded: Promise<Driver> | undefined
  const driver = () => (loaded ??= import('unstorage/drivers/s3').then(module => module.default(options) as Driver))
  return {
    name: 's3',
    options,
    hasItem: async (key, opts) => (await driver()).hasItem(key, opts),
    getItem: async (key, opts) => (await driver()).getItem(key, opts),
    getItemRaw: async (key, opts) => (await driver()).getItemRaw!(key, opts),
    setItem: async (key, value, opts) => (await driver()).setItem!(key, value, opts),
    setItemRaw: async (key, value, opts) => (await driver()).setItemRaw!(key, value, opts),
    removeItem: async (key, opts) => (await driver()).removeItem!(key, opts),
    getMeta: async (key, opts) => (await driver()).getMeta!(key, opts),
    getKeys: async (base, opts) => (await driver()).getKeys(base, opts),
    clear: async (base, opts) => (await driver()).clear!(base, opts),
  }
}

/**
 * Mounts the `attachments` storage that holds the bytes of data files.
 * - Default: files on local disk under `${THERMOTOME_DATA_DIR ?? '.data'}/uploads`.
 * - With THERMOTOME_S3_BUCKET set: an S3-compatible bucket through unstorage's s3 driver
 *   (THERMOTOME_S3_ENDPOINT, THERMOTOME_S3_REGION, THERMOTOME_S3_ACCESS_KEY_ID,
 *   THERMOTOME_S3_SECRET_ACCESS_KEY, all required).
 * Keys are `<entryId>/<uuid>`, never derived from the uploaded name.
 */
export default defineNitroPlugin(() => {
  const storage = useStorage()
  const bucket = process.env.THERMOTOME_S3_BUCKET
  if (bucket) {
    const names = ['THERMOTOME_S3_ENDPOINT', 'THERMOTOME_S3_REGION', 'THERMOTOME_S3_ACCESS_KEY_ID', 'THERMOTOME_S3_SECRET_ACCESS_KEY'] as const
    const missing = names.filter(name => !process.env[name])
    if (missing.length > 0)
      throw new Error(`THERMOTOME_S3_BUCKET is set but ${missing.join(', ')} ${missing.length === 1 ? 'is' : 'are'} not: set all of them.`)
    storage.mount('attachments', lazyS3Driver({
      bucket,
      endpoint: process.env.THERMOTOME_S3_ENDPOINT!,
      region: process.env.THERMOTOME_S3_REGION!,
      accessKeyId: process.env.THERMOTOME_S3_ACCESS_KEY_ID!,
      secretAccessKey: process.env.THERMOTOME_S3_SECRET_ACCESS_KEY!,
    }))
    return
  }
  storage.mount('attachments', fsDriver({ base: resolve(process.env.THERMOTOME_DATA_DIR ?? '.data', 'uploads') }))
})
