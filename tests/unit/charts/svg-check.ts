// A tiny XML reader for the chart tests: enough to prove the SVG is well formed (matched
// tags, quoted attributes, only the five predefined entities or numeric references, no raw
// "<" or "&" in text) and to walk the element tree.

export interface XmlElement {
  name: string
  attributes: Record<string, string>
  children: XmlElement[]
  /** Decoded text directly inside this element. */
  text: string
}

const entities: Record<string, string> = { amp: '&', lt: '<', gt: '>', quot: '"', apos: "'" }

function decode(raw: string, where: string): string {
  if (/[<]/.test(raw)) throw new Error(`raw "<" in ${where}`)
  return raw.replace(/&([^;]*);?/g, (match, name: string) => {
    if (!match.endsWith(';')) throw new Error(`bare "&" in ${where}`)
    if (name in entities) return entities[name]!
    if (/^#x[0-9a-f]+$/i.test(name)) return String.fromCodePoint(parseInt(name.slice(2), 16))
    if (/^#[0-9]+$/.test(name)) return String.fromCodePoint(Number(name.slice(1)))
    throw new Error(`unknown entity &${name}; in ${where}`)
  })
}

/** Parses a document with one root element; throws on anything not well formed. */
export function parseXml(source: string): XmlElement {
  const stack: XmlElement[] = []
  let root: XmlElement | undefined
  let position = 0
  const tagPattern = /<(\/?)([A-Za-z][\w:.-]*)((?:\s+[A-Za-z_:][\w:.-]*\s*=\s*(?:"[^"]*"|'[^']*'))*)\s*(\/?)>/y
  while (position < source.length) {
    const next = source.indexOf('<', position)
    const textEnd = next === -1 ? source.length : next
    const raw = source.slice(position, textEnd)
    if (raw) {
      const text = decode(raw, 'text')
      if (stack.length === 0) {
        if (raw.trim()) throw new Error('text outside the root element')
      } else stack[stack.length - 1]!.text += text
    }
    if (next === -1) break
    tagPattern.lastIndex = next
    const match = tagPattern.exec(source)
    if (!match) throw new Error(`malformed tag at ${next}: ${source.slice(next, next + 60)}`)
    const [whole, closing, name, attributeText, selfClosing] = match
    if (closing) {
      const open = stack.pop()
      if (!open || open.name !== name) throw new Error(`</${name}> closes <${open?.name}>`)
    } else {
      const attributes: Record<string, string> = {}
      for (const attribute of attributeText!.matchAll(/([A-Za-z_:][\w:.-]*)\s*=\s*(?:"([^"]*)"|'([^']*)')/g)) {
        if (attribute[1]! in attributes) throw new Error(`duplicate attribute ${attribute[1]}`)
        attributes[attribute[1]!] = decode(attribute[2] ?? attribute[3] ?? '', `attribute ${attribute[1]}`)
      }
      const element: XmlElement = { name: name!, attributes, children: [], text: '' }
      if (stack.length) stack[stack.length - 1]!.children.push(element)
      else if (root) throw new Error('more than one root element')
      else root = element
      if (!selfClosing) stack.push(element)
    }
    position = next + whole!.length
  }
  if (stack.length) throw new Error(`<${stack[stack.length - 1]!.name}> is not closed`)
  if (!root) throw new Error('no root element')
  return root
}

export function allElements(root: XmlElement): XmlElement[] {
  return [root, ...root.children.flatMap(allElements)]
}

/** All text of an element and its descendants, in document order. */
export function textContent(element: XmlElement): string {
  return element.text + element.children.map(textContent).join('')
}
