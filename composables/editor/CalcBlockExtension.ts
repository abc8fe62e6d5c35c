/**
 * The calculation-block node for TipTap: an atom block holding {blockId, kind, title, input,
 * collapsed}, drawn by a Vue node view. In the clipboard its attributes travel as data-*
 * JSON; a plugin gives every pasted or duplicated block an id of its own.
 */
import { mergeAttributes, Node } from '@tiptap/core'
import { Plugin, PluginKey } from '@tiptap/pm/state'
import { VueNodeViewRenderer } from '@tiptap/vue-3'
import { CALCULATION_BLOCK, randomBlockId } from '#shared/editor/nodes'
import EditorCalcBlockView from '~/components/editor/CalcBlockView.vue'

const jsonAttribute = (name: string, fallback: unknown) => ({
  default: fallback,
  parseHTML: (element: HTMLElement) => {
    try {
      return JSON.parse(element.getAttribute(`data-${name}`) ?? 'null') ?? fallback
    }
    catch {
      return fallback
    }
  },
  renderHTML: (attributes: Record<string, unknown>) => ({ [`data-${name}`]: JSON.stringify(attributes[name]) }),
})

export const CalcBlockExtension = Node.create({
  name: CALCULATION_BLOCK,
  group: 'block',
  atom: true,
  selectable: true,
  draggable: false,

  addAttributes() {
    return {
      blockId: jsonAttribute('block-id', null),
      kind: jsonAttribute('kind', 'levels'),
      title: jsonAttribute('title', ''),
      input: jsonAttribute('input', {}),
      collapsed: jsonAttribute('collapsed', false),
    }
  },

  parseHTML() {
    return [{ tag: 'div[data-calculation-block]' }]
  },

  renderHTML({ HTMLAttributes }) {
    return ['div', mergeAttributes({ 'data-calculation-block': '' }, HTMLAttributes)]
  },

  addNodeView() {
    // Everything inside the block (fields, buttons, details) belongs to the block, not to the text editor.
    return VueNodeViewRenderer(EditorCalcBlockView, { stopEvent: ({ event }) => !event.type.startsWith('drag') && event.type !== 'drop' })
  },

  addProseMirrorPlugins() {
    return [new Plugin({
      key: new PluginKey('calculationBlockIds'),
      appendTransaction: (transactions, _old, state) => {
        if (!transactions.some(transaction => transaction.docChanged)) return null
        const seen = new Set<string>()
        let transaction = null
        state.doc.descendants((node, position) => {
          if (node.type.name !== CALCULATION_BLOCK) return
          const id = node.attrs.blockId as string | null
          if (id && !seen.has(id)) {
            seen.add(id)
            return false
          }
          const fresh = randomBlockId()
          seen.add(fresh)
          transaction ??= state.tr
          transaction.setNodeMarkup(position, undefined, { ...node.attrs, blockId: fresh })
          return false
        })
        return transaction
      },
    })]
  },
})
