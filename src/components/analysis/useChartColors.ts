import { computed } from 'vue'
import { useTheme } from 'vuetify'

/** Chart colours taken from the active Vuetify theme, so charts follow light and dark. */
export function useChartColors() {
  const theme = useTheme()
  return computed(() => {
    const c = theme.current.value.colors
    const dark = theme.current.value.dark
    return {
      primary: c.primary!,
      accent: c.accent ?? c.secondary!,
      secondary: c.secondary!,
      info: c.info!,
      success: c.success!,
      warning: c.warning!,
      error: c.error!,
      text: c['on-surface']!,
      muted: dark ? 'rgba(255,255,255,0.55)' : 'rgba(0,0,0,0.55)',
      grid: dark ? 'rgba(255,255,255,0.12)' : 'rgba(0,0,0,0.1)',
      surface: c.surface!,
    }
  })
}
