import type { Directive } from 'vue'

/**
 * `v-scroll-region="'Reflections'"`: a box that scrolls sideways (a wide table on a phone, a long code
 * line) becomes reachable by keyboard while it overflows: a tab stop, named for screen readers, so the
 * arrow keys scroll it (WCAG 2.2 SC 2.1.1 Keyboard). A box that fits stays out of the tab order.
 * On a Vuetify table the scrolling box is its inner wrapper.
 */
const watched = new WeakMap<HTMLElement, { observer: ResizeObserver; label: string }>()

function boxOf(el: HTMLElement): HTMLElement {
  return el.classList.contains('v-table') ? (el.querySelector<HTMLElement>(':scope > .v-table__wrapper') ?? el) : el
}

function update(el: HTMLElement): void {
  const entry = watched.get(el)
  if (!entry) return
  const box = boxOf(el)
  if (box.scrollWidth > box.clientWidth + 1 || box.scrollHeight > box.clientHeight + 1) {
    box.setAttribute('tabindex', '0')
    box.setAttribute('role', 'region')
    box.setAttribute('aria-label', entry.label)
  } else {
    box.removeAttribute('tabindex')
    box.removeAttribute('role')
    box.removeAttribute('aria-label')
  }
}

export const vScrollRegion: Directive<HTMLElement, string> = {
  mounted(el, binding) {
    const observer = new ResizeObserver(() => update(el))
    watched.set(el, { observer, label: binding.value })
    observer.observe(el)
    observer.observe(boxOf(el))
    const content = boxOf(el).firstElementChild
    if (content) observer.observe(content)
    update(el)
  },
  updated(el, binding) {
    const entry = watched.get(el)
    if (entry) entry.label = binding.value
    update(el)
  },
  unmounted(el) {
    watched.get(el)?.observer.disconnect()
    watched.delete(el)
  },
}

declare module 'vue' {
  interface GlobalDirectives {
    vScrollRegion: typeof vScrollRegion
  }
}
