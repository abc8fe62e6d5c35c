import { parseEmbedOrigins, type EmbedMessage } from '#shared/embed'

/**
 * Messages from an embedded page to its host window. The host names itself with ?host=ORIGIN;
 * messages go only to that origin and only when it is one of the allowed embed origins, so a
 * page framed (or opened) by anyone else tells nobody anything.
 */
export function useHostMessages() {
  const route = useRoute()
  const config = useRuntimeConfig()
  const allowed = parseEmbedOrigins(String(config.public.embedOrigins ?? ''))
  const requested = typeof route.query.host === 'string' ? route.query.host : ''
  const target = allowed.includes(requested) ? requested : null

  function post(message: Omit<EmbedMessage, 'source' | 'protocol'>) {
    if (!import.meta.client || !target || window.parent === window)
      return
    window.parent.postMessage({ source: 'thermotome', protocol: 1, ...message } satisfies EmbedMessage, target)
  }

  /** Report the document height whenever it changes, so the host can size the frame. */
  function watchHeight(entryId?: string) {
    if (!import.meta.client || !target)
      return
    let last = 0
    const observer = new ResizeObserver(() => {
      const height = Math.ceil(document.documentElement.scrollHeight)
      if (height !== last) {
        last = height
        post({ event: 'height-changed', entryId, height })
      }
    })
    onMounted(() => observer.observe(document.body))
    onBeforeUnmount(() => observer.disconnect())
  }

  return { post, watchHeight, hostOrigin: target }
}
