import { describe, expect, it } from 'vitest'
import { isStorageFull } from '../../../server/utils/storageErrors'

describe('recognising a full file store', () => {
  it('knows ENOSPC and EDQUOT, also wrapped as a cause (Node fs error codes)', () => {
    expect(isStorageFull(Object.assign(new Error('ENOSPC: no space left on device, write'), { code: 'ENOSPC' }))).toBe(true)
    expect(isStorageFull(new Error('[unstorage] failed', { cause: Object.assign(new Error('quota'), { code: 'EDQUOT' }) }))).toBe(true)
  })
  it('leaves other errors alone', () => {
    expect(isStorageFull(Object.assign(new Error('no such file'), { code: 'ENOENT' }))).toBe(false)
    expect(isStorageFull(new Error('plain'))).toBe(false)
    expect(isStorageFull(undefined)).toBe(false)
  })
})
