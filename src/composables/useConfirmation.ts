import { onBeforeUnmount, ref } from 'vue'

/**
 * A short confirmation shown beside the control that caused it (where the eye already is), read out
 * by screen readers through the element's role="status", and cleared by itself after `ms`.
 */
export function useConfirmation(ms = 6000) {
  const text = ref<string | null>(null)
  const tone = ref<'success' | 'error'>('success')
  let timer: ReturnType<typeof setTimeout> | null = null
  function clear(): void {
    if (timer) clearTimeout(timer)
    timer = null
    text.value = null
  }
  function show(message: string, kind: 'success' | 'error' = 'success'): void {
    clear()
    text.value = message
    tone.value = kind
    // errors stay until the next action; confirmations fade
    if (kind === 'success') timer = setTimeout(clear, ms)
  }
  onBeforeUnmount(clear)
  return { text, tone, show, clear }
}
