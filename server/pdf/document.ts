// The record PDF as a pdfmake document definition: a pure function of the signed bundle, the
// entry's state and its audit events. Nothing here reads the clock or random numbers, so the
// same record always gives the same document (and, with fixed metadata, the same bytes).
import { canonicalJson, formatFingerprint, type Calculation, type RecordBundle, type VerificationReport } from '../../shared/records'
import { auditActionWords } from '../../shared/audit/actions'
import { auditDetailsWords } from '../../shared/audit/details'
import { columnHeader, presentResult, type PresentedRow, type PresentedTable } from '../../shared/present'
import type { VersionStatus } from '../../shared/records/lifecycle'
import { registry } from '../../shared/thermo'
import { utcText } from '../../shared/time'
import { svgForPdf } from './svg'
import { textRuns, type TextRun } from './text'

export type PdfEntryState = VersionStatus

export interface PdfAuditEvent {
  sequence: number
  occurredAt: string
  action: string
  actorEmail: string | null
  /** The person's name at export time (the audit row keeps the e-mail it was written with). */
  actorName?: string | null
  details: unknown
}

export interface RecordPdfInput {
  bundle: RecordBundle
  /** State of this version: the entry's state for its current version, 'superseded' for older ones. */
  state: PdfEntryState
  /** The entry's own audit events, oldest first. */
  auditEvents: PdfAuditEvent[]
  /** verifyBundle(bundle), checked again at export (DESIGN: "verifies ... again on export"). */
  verification: VerificationReport
}

export const STATE_WORDS: Record<PdfEntryState, string> = {
  draft: 'Draft',
  awaiting_witness: 'Signed — awaiting witness',
  witnessed: 'Witnessed',
  declined: 'Declined by the witness',
  superseded: 'Superseded by an amendment',
}
const STATE_COLORS: Record<PdfEntryState, string> = {
  draft: '#6b6b6b', awaiting_witness: '#a86a00', witnessed: '#1d5e3a', declined: '#9c3a25', superseded: '#8f8a80',
}
const MEANING_WORDS: Record<string, string> = {
  authored: 'Authored — signed by the author',
  witnessed: 'Witnessed — read and understood',
  reviewed: 'Reviewed',
}

export const CAUTIONS = [
  'A calculation record is evidence, not validation: it shows what was computed from what input, not that the model fits the system.',
  'Results depend on the model chosen (harmonic oscillator, rigid rotor, ideal gas); read each calculation block\'s warnings.',
  'Electronic signatures become binding only inside a validated system, under local regulation and the site\'s own procedures.',
  'Work at high fields, high temperatures or with lasers follows the site\'s safety rules.',
]

const INK = '#1f1d1a'
const INK_SOFT = '#4a463f'
const INK_FAINT = '#7a7468'
const RULE = '#cfc7b3'
const PAPER_DEEP = '#f3eee2'


type Content = Record<string, unknown> | string | Content[]

const registryTitle = (kind: string) => registry[kind]?.title ?? kind

/**
 * Long unbroken tokens (hashes, e-mail addresses, ids, long names) get break opportunities
 * (a zero-width space after every 16 characters, and after @ . / - _ inside them) so a table
 * cell wraps inside its column instead of running past the page edge.
 */
export function breakable(text: string): string {
  return text.replace(/\S{17,}/g, token => token.replace(/([@./_-])(?=\S)/g, '$1\u200B').split('\u200B').map(piece => piece.replace(/(.{16})(?=.)/g, '$1\u200B')).join('\u200B'))
}
type Inline = string | Record<string, unknown>

/** A paragraph-level text node from a plain string, with font runs and sup/sub. */
function para(text: string, style: Record<string, unknown> = {}): Record<string, unknown> {
  return { text: textRuns(text), ...style }
}

function runsArray(text: string): Inline[] {
  const runs = textRuns(text)
  return typeof runs === 'string' ? [runs] : runs as TextRun[] as unknown as Inline[]
}

// ---------------------------------------------------------------------------------------
// Editor JSON (TipTap / ProseMirror) → pdfmake

interface DocNode { type?: string, text?: string, attrs?: Record<string, any>, content?: DocNode[], marks?: { type: string, attrs?: Record<string, any> }[] }

function inlineNodes(nodes: DocNode[] | undefined): Inline[] {
  const out: Inline[] = []
  for (const node of nodes ?? []) {
    if (node.type === 'hardBreak') { out.push('\n'); continue }
    if (node.type !== 'text') {
      // An unknown inline node keeps its text, never disappears silently.
      const inner = inlineNodes(node.content)
      if (inner.length) out.push(...inner)
      continue
    }
    const style: Record<string, unknown> = {}
    let superscript = false
    let subscript = false
    const decorations: string[] = []
    for (const mark of node.marks ?? []) {
      if (mark.type === 'bold') style.bold = true
      else if (mark.type === 'italic') style.italics = true
      else if (mark.type === 'underline') decorations.push('underline')
      else if (mark.type === 'strike') decorations.push('lineThrough')
      else if (mark.type === 'code') { style.background = PAPER_DEEP; style.color = INK_SOFT }
      else if (mark.type === 'superscript') superscript = true
      else if (mark.type === 'subscript') subscript = true
      else if (mark.type === 'link' && typeof mark.attrs?.href === 'string' && /^https?:\/\//i.test(mark.attrs.href)) {
        style.color = '#2a4f8f'
        decorations.push('underline')
        style.link = mark.attrs.href
      }
    }
    if (decorations.length) style.decoration = decorations[0]
    if (superscript) style.sup = true
    if (subscript) style.sub = true
    const runs = runsArray(node.text ?? '')
    out.push(Object.keys(style).length ? { text: runs, ...style } : { text: runs })
  }
  return out
}

interface BlockContext {
  calculations: Map<string, Calculation>
  blockNumber: { value: number }
}

function listItems(node: DocNode, context: BlockContext): Content[] {
  return (node.content ?? []).map(item => {
    const blocks = blockNodes(item.content, context)
    return blocks.length === 1 ? blocks[0]! : { stack: blocks }
  })
}

function tableNode(node: DocNode, context: BlockContext): Content {
  const rows = (node.content ?? []).filter(row => row.type === 'tableRow')
  const width = Math.max(1, ...rows.map(row => (row.content ?? []).length))
  const body = rows.map(row => {
    const cells: Content[] = (row.content ?? []).map(cell => {
      const blocks = blockNodes(cell.content, context)
      const stack = { stack: blocks.length ? blocks : [''], ...(cell.type === 'tableHeader' ? { bold: true, fillColor: PAPER_DEEP } : {}) }
      return stack
    })
    while (cells.length < width) cells.push('')
    return cells
  })
  if (!body.length) return ''
  return { table: { widths: Array(width).fill('*'), body }, layout: 'recordGrid', margin: [0, 2, 0, 8] }
}

function blockNodes(nodes: DocNode[] | undefined, context: BlockContext): Content[] {
  const out: Content[] = []
  for (const node of nodes ?? []) {
    switch (node.type) {
      case 'paragraph':
        out.push({ text: inlineNodes(node.content).length ? inlineNodes(node.content) : ' ', margin: [0, 0, 0, 6] })
        break
      case 'heading': {
        const level = Math.min(3, Math.max(1, Number(node.attrs?.level ?? 2)))
        out.push({ text: inlineNodes(node.content), style: `entryHeading${level}` })
        break
      }
      case 'bulletList':
        out.push({ ul: listItems(node, context), margin: [0, 0, 0, 6] })
        break
      case 'orderedList':
        out.push({ ol: listItems(node, context), start: Number(node.attrs?.start ?? 1), margin: [0, 0, 0, 6] })
        break
      case 'blockquote':
        out.push({ stack: blockNodes(node.content, context), margin: [14, 0, 0, 6], color: INK_SOFT, italics: true })
        break
      case 'codeBlock':
        out.push({
          table: { widths: ['*'], body: [[{ text: inlineNodes(node.content), preserveLeadingSpaces: true, fontSize: 9 }]] },
          layout: 'recordShaded', margin: [0, 0, 0, 6],
        })
        break
      case 'horizontalRule':
        out.push({ canvas: [{ type: 'line', x1: 0, y1: 4, x2: 515, y2: 4, lineWidth: 0.5, lineColor: RULE }], margin: [0, 2, 0, 8] })
        break
      case 'table':
        out.push(tableNode(node, context))
        break
      case 'calculationBlock':
        out.push(calculationBlock(node, context))
        break
      default:
        if (node.content) out.push(...blockNodes(node.content, context))
        else if (node.type === 'text') out.push({ text: inlineNodes([node]) })
    }
  }
  return out
}

// ---------------------------------------------------------------------------------------
// Calculation blocks: title, inputs, results, warnings, chart

/** Rows of a long table printed in the PDF; the bundle and the CSV hold every row. */
const PDF_TABLE_ROWS = 60

/** A presented table (shared/present) as a pdfmake table that wraps inside the margins. */
function presentedTable(table: PresentedTable): Content {
  const shown = table.rows.slice(0, PDF_TABLE_ROWS)
  const body: Content[][] = [
    [{ text: textRuns(table.caption), style: 'tableHeader', colSpan: table.columns.length }, ...table.columns.slice(1).map(() => '')],
    table.columns.map(column => ({ text: textRuns(columnHeader(column)), style: 'tableHeader', ...(column.numeric ? { alignment: 'right' } : {}) })),
    ...shown.map(row => row.map((cell, index) => para(breakable(cell), table.columns[index]?.numeric ? { alignment: 'right' } : {}))),
  ]
  const notes: Content[] = []
  if (table.totalRows > shown.length) notes.push(para(`${(table.totalRows - shown.length).toLocaleString('en-US')} more rows are not printed; every row is in the attached bundle and the calculation's CSV.`, { style: 'small' }))
  return { stack: [{ table: { headerRows: 2, dontBreakRows: true, widths: table.columns.map(() => '*'), body }, layout: 'recordGrid', fontSize: 7.5 }, ...notes], margin: [0, 0, 0, 6] }
}

function rowsTable(title: string, rows: PresentedRow[], input: boolean): Content {
  const body: Content[][] = [
    [{ text: textRuns(title), style: 'tableHeader', colSpan: 3 }, '', ''],
    ...rows.map(row => input
      ? [para(breakable(row.label), { color: INK_SOFT }), para(breakable(row.value)), para(row.si ? `= ${row.si}` : '', { color: INK_SOFT })]
      : [
          para(`${row.label}${row.symbol ? ` ${row.symbol}` : ''}`, { color: INK_SOFT }),
          para(breakable(row.uncertainty ? `${row.value} ± ${row.uncertainty}` : row.value), { bold: true, alignment: 'right' }),
          para(row.unit ?? ''),
        ]),
  ]
  return { table: { dontBreakRows: true, widths: input ? ['*', 150, 120] : ['*', 130, 90], body }, layout: 'recordGrid', fontSize: 8.5, margin: [0, 0, 0, 6] }
}

function calculationBlock(node: DocNode, context: BlockContext): Content {
  context.blockNumber.value++
  const blockId = String(node.attrs?.blockId ?? '')
  const calculation = context.calculations.get(blockId)
  const title = String(node.attrs?.title || (calculation ? registryTitle(calculation.kind) : '') || 'Calculation block')
  const heading = para(`Calculation block ${context.blockNumber.value}: ${title}`, { style: 'blockTitle' })
  if (!calculation) {
    return { stack: [heading, para('This block has no computed result in the signed record.', { color: '#9c3a25' })], margin: [0, 4, 0, 10] }
  }
  const presented = presentResult(calculation.kind, calculation.input, calculation.result, { chartWidth: 640, chartHeight: 300 }, calculation.warnings)
  const parts: Content[] = [
    heading,
    para(`${presented.title} · engine ${calculation.engineVersion} · block ${calculation.blockId}`, { style: 'small', margin: [0, 0, 0, 2] }),
    para(`Model: ${presented.model}`, { style: 'small', margin: [0, 0, 0, 4] }),
  ]
  if (presented.inputs.rows.length) parts.push(rowsTable(presented.inputs.title, presented.inputs.rows, true))
  parts.push(...presented.inputTables.map(presentedTable))
  for (const section of presented.sections) parts.push(rowsTable(`${section.title}, computed by the server`, section.rows, false))
  if (presented.warnings.length) {
    parts.push({ stack: [para('Warnings', { bold: true }), { ul: presented.warnings.map(warning => para(warning)) }], margin: [0, 0, 0, 6], color: '#8a5a2b' })
  }
  for (const chart of presented.charts) {
    parts.push({
      stack: [
        para(chart.title, { bold: true, fontSize: 9, margin: [0, 2, 0, 0] }),
        { svg: svgForPdf(chart.svg), font: 'Atkinson', width: 470, alignment: 'center', margin: [0, 2, 0, 2] },
        para(chart.alt, { style: 'small', margin: [0, 0, 0, 4] }),
      ],
      unbreakable: true,
    })
  }
  parts.push(...presented.tables.map(presentedTable))
  parts.push(para(presented.conventions, { style: 'small', margin: [0, 0, 0, 2] }))
  return { stack: parts, margin: [0, 4, 0, 12] }
}

// ---------------------------------------------------------------------------------------
// Signatures, hash, attachments, audit, cautions

function signatureBlock(bundle: RecordBundle, verification: VerificationReport): Content[] {
  return bundle.signatures.map((envelope, index) => {
    const { statement } = envelope
    const check = verification.signatures.find(item => item.index === index)
    const valid = check?.ok ?? false
    const rows: Content[][] = [
      [para('Printed name', { color: INK_SOFT }), para(statement.signer.name, { bold: true })],
      [para('E-mail', { color: INK_SOFT }), para(statement.signer.email)],
      [para('Signed at', { color: INK_SOFT }), para(utcText(statement.signedAt))],
      [para('Meaning', { color: INK_SOFT }), para(MEANING_WORDS[statement.meaning] ?? statement.meaning)],
      [para('Statement', { color: INK_SOFT }), para(statement.statement)],
      [para('Key fingerprint', { color: INK_SOFT }), para(formatFingerprint(statement.keyFingerprint), { fontSize: 8 })],
      ...confirmationRows(bundle, statement.keyFingerprint),
      [para('Checked at export', { color: INK_SOFT }), para(valid ? 'Signature valid' : `NOT VALID: ${(check?.problems ?? ['not checked']).join('; ')}`, { bold: true, color: valid ? '#1d5e3a' : '#9c3a25' })],
    ]
    return {
      table: { widths: [110, '*'], dontBreakRows: true, body: [[{ text: `Signature ${index + 1}`, style: 'tableHeader', colSpan: 2 }, ''], ...rows] },
      layout: 'recordGrid', margin: [0, 0, 0, 8], unbreakable: true,
    }
  })
}

/** Beside a signature made with a replacement key: who confirmed the key, when, and why. */
function confirmationRows(bundle: RecordBundle, fingerprint: string): Content[][] {
  const confirmation = bundle.publicKeys.find(listing => listing.fingerprint === fingerprint)?.confirmation
  if (!confirmation) return []
  return [[
    para('Replacement key', { color: INK_SOFT }),
    para(`Confirmed by ${confirmation.confirmedBy.name} <${confirmation.confirmedBy.email}> on ${utcText(confirmation.confirmedAt)}: ${confirmation.reason}`),
  ]]
}

/** The checkpoint that anchors the audit events: a signed tree head of the whole audit log. */
function anchorBlock(bundle: RecordBundle): Content {
  const document = bundle.context?.checkpoint
  if (!document) return para('No checkpoint of the audit log anchors these events: they rest on the database alone.', { style: 'small', margin: [0, 0, 0, 10] })
  let checkpoint: { treeSize?: number, rootHash?: string, signedAt?: string, recordsKey?: string } = {}
  try { checkpoint = JSON.parse(document.payload) as typeof checkpoint }
  catch { /* printed as unreadable below; verification reports it */ }
  const rows: Content[][] = [
    ['Events in the log', String(checkpoint.treeSize ?? 'unreadable')],
    ['Merkle root (RFC 9162)', { text: checkpoint.rootHash ?? 'unreadable', fontSize: 7.5 }],
    ['Signed at', checkpoint.signedAt ? utcText(checkpoint.signedAt) : 'unreadable'],
    ['Records key', { text: checkpoint.recordsKey ? formatFingerprint(checkpoint.recordsKey) : 'unreadable', fontSize: 7.5 }],
  ].map(([label, value]) => [para(label as string, { color: INK_SOFT }), typeof value === 'string' ? para(value) : value as Content])
  return {
    stack: [
      para('Audit checkpoint', { bold: true, margin: [0, 0, 0, 2] }),
      { table: { widths: [110, '*'], body: rows }, layout: 'recordGrid', fontSize: 8.5, margin: [0, 0, 0, 4] },
      para('The events above are leaves of a Merkle tree over the whole audit log; this tree head is signed with the organisation\'s records key, and the bundle carries an inclusion proof for each event. Removing, inserting or changing any earlier audit event changes the root.', { style: 'small' }),
    ],
    margin: [0, 0, 0, 10],
  }
}

function hashBlock(bundle: RecordBundle, fileName: string): Content {
  return {
    stack: [
      para('Record hash (SHA-256)', { style: 'sectionTitle' }),
      { text: bundle.recordHash, fontSize: 10, bold: true, margin: [0, 0, 0, 4], characterSpacing: 0.3 },
      para(
        `How to verify: the record hash is the SHA-256 of the RFC 8785 canonical JSON of the record. The signed bundle (record, signing statements, Ed25519 signatures and public keys) is attached to this PDF as "${fileName}" and can be downloaded as JSON from the records workspace. Check it without Thermotome's database with "npm run verify -- ${fileName}" (or give the command this PDF), or on the Verify page: each signature must be valid and cover this hash.`,
        { style: 'small' },
      ),
    ],
    margin: [0, 4, 0, 10],
  }
}

function attachmentsBlock(bundle: RecordBundle): Content {
  const rows = bundle.record.attachments
  if (!rows.length) return para('No data files are attached to this version.', { style: 'small', margin: [0, 0, 0, 10] })
  return {
    table: {
      headerRows: 1, widths: ['*', 80, 50, 200],
      body: [
        ['File', 'Media type', 'Bytes', 'SHA-256'].map(text => ({ text, style: 'tableHeader' })),
        ...rows.map(file => [para(file.name), para(file.mediaType), { text: String(file.size), alignment: 'right' }, { text: file.sha256, fontSize: 7 }]),
      ],
    },
    layout: 'recordGrid', fontSize: 8.5, margin: [0, 0, 0, 10],
  }
}

/** An event's details in words (shared/audit/details.ts), cut to a length a table cell holds. */
function detailsText(event: PdfAuditEvent, entryTitle: string): string {
  const details = event.details as Record<string, unknown> | null
  const text = auditDetailsWords(event.action, details, details?.title === entryTitle ? ['title'] : [])
  return text.length > 400 ? `${text.slice(0, 399)}…` : text
}

function auditBlock(events: PdfAuditEvent[], entryTitle: string): Content {
  if (!events.length) return para('No audit events are recorded for this entry.', { style: 'small' })
  return {
    table: {
      // Fixed columns leave the details column at least 230 pt on A4 and Letter; every cell
      // breaks long tokens (hashes, addresses) so nothing runs past the margin.
      headerRows: 1, dontBreakRows: true, widths: [24, 66, 82, 104, '*'],
      body: [
        ['#', 'Time (UTC +00:00)', 'Action', 'By', 'Details'].map(text => ({ text, style: 'tableHeader' })),
        ...events.map(event => [
          String(event.sequence), para(utcText(event.occurredAt).replace(' UTC', ' +00:00')),
          { stack: [para(auditActionWords(event.action)), para(breakable(event.action), { fontSize: 6.5, color: INK_SOFT })] },
          { stack: [para(breakable(event.actorName ?? (event.actorEmail ? event.actorEmail : 'system'))), ...(event.actorName && event.actorEmail ? [para(breakable(event.actorEmail), { fontSize: 6.5, color: INK_SOFT })] : [])] },
          para(breakable(detailsText(event, entryTitle))),
        ]),
      ],
    },
    layout: 'recordGrid', fontSize: 7.5, margin: [0, 0, 0, 10],
  }
}

/** Characters that would break pdfkit's hand-written XMP packet (it does not escape). */
function metadataText(text: string): string {
  return text.replace(/&/g, 'and').replace(/</g, '‹').replace(/>/g, '›')
}

export function bundleFileName(bundle: RecordBundle): string {
  return `thermotome-record-${bundle.record.entry.id}-v${bundle.record.entry.version}.json`
}

/** The signing time the PDF carries as its creation date: the latest signature (or the record's first). */
export function recordPdfDate(bundle: RecordBundle): Date {
  const times = bundle.signatures.map(envelope => Date.parse(envelope.statement.signedAt)).filter(Number.isFinite)
  return new Date(times.length ? Math.max(...times) : 0)
}

/** The whole pdfmake document definition. `bundleJson` is the exact bytes attached. */
export function recordDocumentDefinition(input: RecordPdfInput, bundleJson: string): Record<string, unknown> {
  const { bundle, state, auditEvents, verification } = input
  const { entry } = bundle.record
  const author = bundle.signatures.find(envelope => envelope.statement.meaning === 'authored')?.statement.signer
  const created = recordPdfDate(bundle)
  const fileName = bundleFileName(bundle)
  const context: BlockContext = {
    calculations: new Map(bundle.record.calculations.map(calculation => [calculation.blockId, calculation])),
    blockNumber: { value: 0 },
  }
  const stateWord = STATE_WORDS[state]
  const headerText = `Record ${entry.id} · version ${entry.version} · ${stateWord}`

  const summaryRows: Content[][] = [
    ['Notebook', para(entry.notebook.name)],
    ['Entry', para(entry.id)],
    ['Version', para(entry.supersedes ? `${entry.version} (amends version ${entry.supersedes})` : String(entry.version))],
    ['State', { text: stateWord, bold: true, color: STATE_COLORS[state] }],
    ['Author', para(author ? `${author.name} <${author.email}>` : 'not signed')],
    ['Signatures', para(verification.ok ? `${bundle.signatures.length} — all valid when exported` : `${bundle.signatures.length} — VERIFICATION FAILED when exported: ${verification.problems.join('; ')}`, { color: verification.ok ? INK : '#9c3a25' })],
  ].map(([label, value]) => [{ text: label as string, color: INK_SOFT }, value as Content])

  const entryBlocks = blockNodes((entry.content as DocNode).content, context)
  // Calculations in the record that the document does not place (should not happen) are still printed.
  const placed = new Set<string>()
  const walk = (nodes?: DocNode[]) => nodes?.forEach((node) => { if (node.type === 'calculationBlock') placed.add(String(node.attrs?.blockId)); walk(node.content) })
  walk((entry.content as DocNode).content)
  for (const calculation of bundle.record.calculations) {
    if (!placed.has(calculation.blockId))
      entryBlocks.push(calculationBlock({ type: 'calculationBlock', attrs: { blockId: calculation.blockId, kind: calculation.kind } }, context))
  }

  const content: Content[] = [
    para(entry.title || 'Untitled entry', { style: 'title' }),
    { table: { widths: [70, '*'], body: summaryRows }, layout: 'noBorders', fontSize: 9.5, margin: [0, 0, 0, 10] },
    para('Signatures', { style: 'sectionTitle' }),
    ...signatureBlock(bundle, verification),
    hashBlock(bundle, fileName),
    {
      table: { widths: ['*'], body: [[{ stack: [para('Cautions', { bold: true, margin: [0, 0, 0, 2] }), { ul: CAUTIONS.map(text => para(text)) }], fontSize: 8.5 }]] },
      layout: 'recordShaded', margin: [0, 0, 0, 12],
    },
    para('The entry as signed', { style: 'sectionTitle', pageBreak: 'before' }),
    ...entryBlocks,
    para('Attached data files', { style: 'sectionTitle' }),
    attachmentsBlock(bundle),
    para('Audit events of this entry', { style: 'sectionTitle' }),
    auditBlock(auditEvents, entry.title),
    anchorBlock(bundle),
  ]

  return {
    pageSize: 'A4',
    pageMargins: [40, 54, 40, 50],
    version: '1.7',
    subset: 'PDF/A-3b',
    tagged: false,
    language: 'en',
    info: {
      title: metadataText(entry.title || 'Untitled entry'),
      author: metadataText(author?.name ?? 'Thermotome'),
      subject: metadataText(`Signed record ${entry.id}, version ${entry.version}, notebook ${entry.notebook.name}; record hash ${bundle.recordHash}`),
      keywords: metadataText(`Thermotome; signed record; ${entry.notebook.name}; ${bundle.recordHash}`),
      creator: 'Thermotome',
      producer: 'Thermotome (pdfmake)',
      creationDate: created,
    },
    files: {
      bundle: {
        src: `data:application/json;base64,${Buffer.from(bundleJson, 'utf8').toString('base64')}`,
        name: fileName,
        type: 'application/json',
        description: 'Thermotome record bundle: canonical record, signing statements, Ed25519 signatures, public keys and export context; this PDF is rendered from it alone',
        relationship: 'Source',
        creationDate: created,
        modifiedDate: created,
      },
    },
    // Every page names the record, its full hash and where it stands: a page alone is traceable.
    header: (currentPage: number) => ({
      stack: [
        {
          columns: [
            { text: 'Thermotome signed record', bold: true, width: 'auto' },
            { text: textRuns(headerText), alignment: 'right' },
          ],
        },
        { text: `Record hash (SHA-256) ${bundle.recordHash}`, fontSize: 7, margin: [0, 1, 0, 0] },
      ],
      margin: [40, 18, 40, 0], fontSize: 8, color: currentPage === 1 ? INK_SOFT : INK_FAINT,
    }),
    footer: (currentPage: number, pageCount: number) => ({
      columns: [
        { text: `Record ${entry.id} · version ${entry.version} · hash ${bundle.recordHash.slice(0, 16)}… · verify with the attached bundle`, width: '*' },
        { text: `Page ${currentPage} of ${pageCount}`, alignment: 'right', width: 70 },
      ],
      margin: [40, 18, 40, 0], fontSize: 8, color: INK_FAINT,
    }),
    content,
    defaultStyle: { font: 'Atkinson', fontSize: 10, lineHeight: 1.2, color: INK },
    styles: {
      title: { fontSize: 18, bold: true, margin: [0, 0, 0, 8] },
      sectionTitle: { fontSize: 12.5, bold: true, margin: [0, 8, 0, 5] },
      blockTitle: { fontSize: 11, bold: true, margin: [0, 4, 0, 1] },
      entryHeading1: { fontSize: 14, bold: true, margin: [0, 8, 0, 4] },
      entryHeading2: { fontSize: 12.5, bold: true, margin: [0, 8, 0, 4] },
      entryHeading3: { fontSize: 11, bold: true, margin: [0, 6, 0, 3] },
      tableHeader: { bold: true, fillColor: PAPER_DEEP },
      small: { fontSize: 8.5, color: INK_SOFT },
    },
  }
}
