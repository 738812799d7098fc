import { nextTick, watch } from 'vue'

/**
 * The control to give focus back to: the focused element, or, when a menu item opened the dialog, the
 * button of that menu (the item is gone once the menu closes). Vuetify's VMenu names its overlay in
 * its activator's `aria-controls`.
 */
function opener(active: Element | null): HTMLElement | null {
  if (!(active instanceof HTMLElement) || active === document.body) return null
  const overlay = active.closest('.v-overlay')
  if (!overlay) return active
  if (!overlay.id) return null
  return document.querySelector<HTMLElement>(`[aria-controls="${CSS.escape(overlay.id)}"]`)
}

/**
 * A dialog opened from a button gives focus back to that button when it closes (WAI-ARIA Authoring
 * Practices, Dialog (Modal) pattern). Vuetify does this only for dialogs with an activator; ours
 * open from a model value, so each calls `useReturnFocus(() => isOpen)`.
 */
export function useReturnFocus(open: () => boolean): void {
  let before: HTMLElement | null = null
  watch(open, async (isOpen) => {
    if (isOpen) {
      before = opener(document.activeElement)
      return
    }
    await nextTick()
    const target = before
    before = null
    const active = document.activeElement
    if (target?.isConnected && (!active || active === document.body || active.closest('.v-overlay'))) target.focus({ preventScroll: true })
  })
}
