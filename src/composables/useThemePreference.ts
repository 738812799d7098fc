import { computed } from 'vue'
import { useTheme } from 'vuetify'
import { themeNames } from '../plugins/vuetify'

const storageKey = 'roomwright.theme'

/** The saved light/dark choice, or the system's preference when nothing is saved. */
export function initialThemeName(): string {
  const saved = localStorage.getItem(storageKey)
  if (saved === themeNames.light || saved === themeNames.dark) return saved
  return window.matchMedia?.('(prefers-color-scheme: dark)').matches ? themeNames.dark : themeNames.light
}

export function useThemePreference() {
  const theme = useTheme()
  const dark = computed({
    get: () => theme.global.name.value === themeNames.dark,
    set: (value: boolean) => {
      const name = value ? themeNames.dark : themeNames.light
      theme.change(name)
      localStorage.setItem(storageKey, name)
    },
  })
  return { dark }
}
