import { beforeAll, describe, expect, it } from 'vitest'
import { as, type Client } from '../support/http'

let admin: Client
let amara: Client
let jonah: Client
let notebookId: string

beforeAll(async () => {
  admin = await as('hana')
  amara = await as('amara')
  jonah = await as('jonah')
  const people = (await admin.get('/api/people')).body.people as { id: string, email: string }[]
  const memberIds = people.filter(p => p.email.startsWith('amara') || p.email.startsWith('jonah')).map(p => p.id)
  const created = await admin.post('/api/notebooks', { name: `Paging bench ${Date.now()}`, description: 'for the list tests', memberIds })
  expect(created.status).toBe(201)
  notebookId = created.body.notebook.id
  // 25 entries by Amara and 5 by Jonah, titles numbered so sort order is known.
  for (let i = 1; i <= 25; i++)
    expect((await amara.post(`/api/notebooks/${notebookId}/entries`, { title: `Survey ${String(i).padStart(2, '0')}` })).status).toBe(201)
  for (let i = 1; i <= 5; i++)
    expect((await jonah.post(`/api/notebooks/${notebookId}/entries`, { title: `Calibration 50% ${i}` })).status).toBe(201)
})

describe('notebook entry lists', () => {
  it('pages on the server', async () => {
    const first = await amara.get(`/api/notebooks/${notebookId}/entries?pageSize=10&sort=title&direction=asc`)
    expect(first.body).toMatchObject({ total: 30, page: 1, pageSize: 10, pages: 3 })
    expect(first.body.entries).toHaveLength(10)
    const third = await amara.get(`/api/notebooks/${notebookId}/entries?pageSize=10&page=3&sort=title&direction=asc`)
    expect(third.body.entries.at(-1).title).toBe('Survey 25')
  })

  it('sorts by title in both directions', async () => {
    const ascending = await amara.get(`/api/notebooks/${notebookId}/entries?pageSize=100&sort=title&direction=asc`)
    const titles = ascending.body.entries.map((e: { title: string }) => e.title)
    expect(titles).toEqual([...titles].sort())
    const descending = await amara.get(`/api/notebooks/${notebookId}/entries?pageSize=100&sort=title&direction=desc`)
    expect(descending.body.entries.map((e: { title: string }) => e.title)).toEqual([...titles].reverse())
  })

  it('searches titles, treating % literally', async () => {
    const found = await amara.get(`/api/notebooks/${notebookId}/entries?q=${encodeURIComponent('50%')}`)
    expect(found.body.total).toBe(5)
    const none = await amara.get(`/api/notebooks/${notebookId}/entries?q=${encodeURIComponent('%')}`)
    expect(none.body.total).toBe(5)
  })

  it('filters by author and state', async () => {
    const people = (await admin.get('/api/people')).body.people as { id: string, email: string }[]
    const jonahId = people.find(p => p.email.startsWith('jonah'))!.id
    expect((await amara.get(`/api/notebooks/${notebookId}/entries?author=${jonahId}`)).body.total).toBe(5)
    expect((await amara.get(`/api/notebooks/${notebookId}/entries?state=draft`)).body.total).toBe(30)
    expect((await amara.get(`/api/notebooks/${notebookId}/entries?state=witnessed`)).body.total).toBe(0)
  })

  it('names the field of a bad query', async () => {
    const reply = await amara.get(`/api/notebooks/${notebookId}/entries?sort=colour`)
    expect(reply.status).toBe(400)
    expect(reply.body.message).toMatch(/^sort:/)
    const page = await amara.get(`/api/notebooks/${notebookId}/entries?page=0`)
    expect(page.status).toBe(400)
    expect(page.body.message).toMatch(/^page:/)
  })

  it('answers 400 for a malformed id and 404 for an unknown one', async () => {
    expect((await amara.get('/api/notebooks/not-a-uuid')).status).toBe(400)
    expect((await amara.get('/api/notebooks/00000000-0000-4000-8000-000000000000')).status).toBe(404)
  })
})

describe('entries', () => {
  it('saves with optimistic concurrency: a stale lock version answers 409', async () => {
    const created = await amara.post(`/api/notebooks/${notebookId}/entries`, { title: 'Concurrency check' })
    const { id, lockVersion } = created.body.entry
    const first = await amara.patch(`/api/entries/${id}`, { lockVersion, title: 'Concurrency check, first save' })
    expect(first.status).toBe(200)
    expect(first.body.entry.lockVersion).toBe(lockVersion + 1)
    const stale = await amara.patch(`/api/entries/${id}`, { lockVersion, title: 'Concurrency check, stale save' })
    expect(stale.status).toBe(409)
    expect(stale.body.message).toMatch(/Someone else changed this entry/)
    const read = await amara.get(`/api/entries/${id}`)
    expect(read.body.entry.title).toBe('Concurrency check, first save')
  })

  it('lets only the author edit, and names bad fields', async () => {
    const created = await amara.post(`/api/notebooks/${notebookId}/entries`, { title: 'Author only' })
    const { id, lockVersion } = created.body.entry
    expect((await jonah.patch(`/api/entries/${id}`, { lockVersion, title: 'Not mine' })).status).toBe(403)
    const bad = await amara.patch(`/api/entries/${id}`, { lockVersion, title: '' })
    expect(bad.status).toBe(400)
    expect(bad.body.message).toMatch(/^title:/)
    const noLock = await amara.patch(`/api/entries/${id}`, { title: 'x' })
    expect(noLock.status).toBe(400)
    expect(noLock.body.message).toMatch(/^lockVersion:/)
    const badDoc = await amara.patch(`/api/entries/${id}`, { lockVersion, content: { type: 'html', content: [] } })
    expect(badDoc.status).toBe(400)
    expect(badDoc.body.message).toMatch(/^content\.type:/)
  })

  it('hides entries of notebooks one does not belong to (404, not 403)', async () => {
    const priya = await as('priya')
    const created = await amara.post(`/api/notebooks/${notebookId}/entries`, { title: 'Members only' })
    expect((await priya.get(`/api/entries/${created.body.entry.id}`)).status).toBe(404)
    expect((await priya.get(`/api/notebooks/${notebookId}/entries`)).status).toBe(404)
  })

  it('refuses a duplicate notebook name, naming the field', async () => {
    const name = `Duplicate ${Date.now()}`
    expect((await admin.post('/api/notebooks', { name })).status).toBe(201)
    const again = await admin.post('/api/notebooks', { name: name.toUpperCase() })
    expect(again.status).toBe(409)
    expect(again.body.message).toMatch(/^name:/)
  })
})
