/**
 * The entry editor's wiring: TipTap with the starter kit, tables, sub- and superscript, links
 * and the calculation-block node; the "/" block picker; every change handed to the entry
 * store, which autosaves it.
 */
import StarterKit from '@tiptap/starter-kit'
import { Subscript } from '@tiptap/extension-subscript'
import { Superscript } from '@tiptap/extension-superscript'
import { Table, TableCell, TableHeader, TableRow } from '@tiptap/extension-table'
import { useEditor } from '@tiptap/vue-3'
import { listKinds } from '#shared/thermo'
import { CALCULATION_BLOCK, newCalculationBlock, randomBlockId } from '#shared/editor/nodes'
import { CalcBlockExtension } from './editor/CalcBlockExtension'

/** Where the block picker opens: under the caret ("/") or under the toolbar button. */
export interface PickerAnchor { top: number, left: number, viaSlash: boolean }

export function useEntryEditor(initialContent: Record<string, unknown>) {
  const store = useEntryStore()
  const picker = ref<PickerAnchor | null>(null)

  const editor = useEditor({
    content: initialContent,
    extensions: [
      StarterKit.configure({
        heading: { levels: [2, 3, 4] },
        link: { openOnClick: false, autolink: true, defaultProtocol: 'https', protocols: ['http', 'https', 'mailto'] },
      }),
      Subscript,
      Superscript,
      Table.configure({ resizable: false }),
      TableRow,
      TableHeader,
      TableCell,
      CalcBlockExtension,
    ],
    editorProps: {
      attributes: { 'class': 'entry-prose entry-editor', 'aria-label': 'Entry text', 'role': 'textbox', 'aria-multiline': 'true' },
      // "/" at the start of an empty line opens the block picker instead of typing.
      handleTextInput(view, from, to, text) {
        if (text !== '/' || from !== to) return false
        const { $from } = view.state.selection
        if ($from.parent.type.name !== 'paragraph' || $from.parent.textContent !== '') return false
        const caret = view.coordsAtPos(from)
        picker.value = { top: caret.bottom + 6, left: caret.left, viaSlash: true }
        return true
      },
    },
    onCreate: () => { performance.mark('thermotome:editor-created') },
    onUpdate: ({ editor: instance }) => {
      store.change({ content: instance.getJSON() as Record<string, unknown> })
    },
  })

  /** Opens the picker under an element (the toolbar button). */
  function openPicker(anchor: HTMLElement) {
    const box = anchor.getBoundingClientRect()
    picker.value = { top: box.bottom + 6, left: box.left, viaSlash: false }
  }

  function closePicker(typeSlash = false) {
    const viaSlash = picker.value?.viaSlash
    picker.value = null
    const chain = editor.value?.chain().focus()
    if (typeSlash && viaSlash) chain?.insertContent('/').run()
    else chain?.run()
  }

  /** Inserts a new block of a kind at the caret, with the kind's example input to start from. */
  function insertBlock(kind: string) {
    const definition = listKinds().find(item => item.kind === kind)
    if (!editor.value || !definition) return
    picker.value = null
    const attrs = newCalculationBlock(kind, definition.title, definition.exampleInput, randomBlockId())
    store.focusBlockId = attrs.blockId
    // No editor focus here: the new block takes the focus in its first field (keyboard path).
    editor.value.commands.insertContent({ type: CALCULATION_BLOCK, attrs })
  }

  /** Replaces the document (after reloading someone else's version) without marking it changed. */
  function replaceContent(content: Record<string, unknown>) {
    editor.value?.commands.setContent(content, { emitUpdate: false })
  }

  return { editor, picker, openPicker, closePicker, insertBlock, replaceContent }
}
