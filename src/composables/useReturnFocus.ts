import { nextTick, watch } from 'vue'

/**
 * A dialog opened from a button gives focus back to that button when it closes (WAI-ARIA Authoring
 * Practices, Dialog (Modal) pattern). Vuetify does this only for dialogs with an activator; ours
 * open from a model value, so each calls `useReturnFocus(() => isOpen)`.
 */
export function useReturnFocus(open: () => boolean): void {
  let before: HTMLElement | null = null
  watch(open, async (isOpen) => {
    if (isOpen) {
      const active = document.activeElement
      before = active instanceof HTMLElement && active !== document.body && !active.closest('.v-overlay') ? active : null
      return
    }
    await nextTick()
    const target = before
    before = null
    const active = document.activeElement
    if (target?.isConnected && (!active || active === document.body || active.closest('.v-overlay'))) target.focus({ preventScroll: true })
  })
}
