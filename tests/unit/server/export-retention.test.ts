import { afterEach, describe, expect, it, vi } from 'vitest'
import { DEFAULT_EXPORT_RETENTION_DAYS, exportRetentionDays, retentionDaysText } from '../../../server/utils/exportJobs'

const NAME = 'THERMOTOME_EXPORT_RETENTION_DAYS'
const before = process.env[NAME]

afterEach(() => {
  if (before === undefined) delete process.env[NAME]
  else process.env[NAME] = before
  vi.restoreAllMocks()
})

describe('THERMOTOME_EXPORT_RETENTION_DAYS', () => {
  it('is 7 days when unset or empty, without a warning', () => {
    const warn = vi.spyOn(console, 'warn').mockImplementation(() => {})
    delete process.env[NAME]
    expect(exportRetentionDays()).toBe(7)
    process.env[NAME] = ' '
    expect(exportRetentionDays()).toBe(7)
    expect(DEFAULT_EXPORT_RETENTION_DAYS).toBe(7)
    expect(warn).not.toHaveBeenCalled()
  })

  it('takes any positive number of days, fractions too', () => {
    process.env[NAME] = '30'
    expect(exportRetentionDays()).toBe(30)
    process.env[NAME] = '0.5'
    expect(exportRetentionDays()).toBe(0.5)
  })

  it('falls back to 7 on anything else and says so once per value', () => {
    const warn = vi.spyOn(console, 'warn').mockImplementation(() => {})
    for (const bad of ['0', '-3', 'seven', 'Infinity', '7d']) {
      process.env[NAME] = bad
      expect(exportRetentionDays(), bad).toBe(7)
      expect(exportRetentionDays(), bad).toBe(7)
    }
    expect(warn).toHaveBeenCalledTimes(5)
    expect(warn.mock.calls[2]![0]).toBe('[exports] THERMOTOME_EXPORT_RETENTION_DAYS="seven" is not a positive number of days; keeping the files of finished exports for 7 days.')
  })

  it('names the period in words', () => {
    expect(retentionDaysText(1)).toBe('1 day')
    expect(retentionDaysText(7)).toBe('7 days')
    expect(retentionDaysText(0.5)).toBe('0.5 days')
  })
})
