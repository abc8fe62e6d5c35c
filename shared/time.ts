/** "2026-03-01 12:00:05 UTC", or to the minute; the text as given when it is not a time. */
export function utcText(value: string | Date, precision: 'second' | 'minute' = 'second'): string {
  const date = new Date(value)
  if (Number.isNaN(date.getTime())) return String(value)
  return `${date.toISOString().slice(0, precision === 'second' ? 19 : 16).replace('T', ' ')} UTC`
}
