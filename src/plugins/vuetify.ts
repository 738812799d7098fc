import { createVuetify, type ThemeDefinition } from 'vuetify'
import { aliases, mdi } from 'vuetify/iconsets/mdi-svg'
import 'vuetify/styles'

/** Warm paper surfaces, a deep teal-ink primary and an amber accent; `panel` is the brand block on the sign-in pages. */
const roomwright: ThemeDefinition = {
  dark: false,
  colors: {
    background: '#F5F1EA',
    surface: '#FFFDF9',
    'surface-bright': '#FFFFFF',
    'surface-light': '#EEE8DE',
    'surface-variant': '#E4DDD1',
    'on-surface-variant': '#4A4540',
    primary: '#1E4D58',
    'primary-darken-1': '#163A43',
    secondary: '#5A6770',
    'secondary-darken-1': '#46525A',
    accent: '#C7861B',
    'on-accent': '#1F1605',
    panel: '#1E4D58',
    'on-panel': '#F5F1EA',
    error: '#B3261E',
    info: '#2B6A94',
    success: '#2E7453',
    // darker than a typical amber so warning text reads at 4.5:1 on the paper surfaces (WCAG 2.2 SC 1.4.3)
    warning: '#8F5300',
  },
  variables: {
    'border-color': '#3B352E',
    'medium-emphasis-opacity': 0.68,
  },
}

const roomwrightDark: ThemeDefinition = {
  dark: true,
  colors: {
    background: '#121719',
    surface: '#1A2124',
    'surface-bright': '#2A3337',
    'surface-light': '#242D31',
    'surface-variant': '#3A4347',
    'on-surface-variant': '#D6D0C6',
    primary: '#7CC2CC',
    'primary-darken-1': '#5FA6B0',
    secondary: '#A9B6BE',
    'secondary-darken-1': '#8D9AA2',
    accent: '#F0B753',
    'on-accent': '#241800',
    panel: '#183A42',
    'on-panel': '#EDE7DC',
    error: '#F2B8B5',
    info: '#8CC3EA',
    success: '#8FD0AE',
    warning: '#F5C27A',
  },
  variables: {
    'border-color': '#E8E2D8',
  },
}

export const themeNames = { light: 'roomwright', dark: 'roomwrightDark' } as const

export const vuetify = createVuetify({
  theme: {
    defaultTheme: themeNames.light,
    themes: { [themeNames.light]: roomwright, [themeNames.dark]: roomwrightDark },
  },
  icons: { defaultSet: 'mdi', aliases, sets: { mdi } },
  display: { mobileBreakpoint: 'md' },
  defaults: {
    VTextField: { variant: 'outlined', density: 'comfortable', color: 'primary' },
    VBtn: { rounded: 'lg' },
    VCard: { rounded: 'lg' },
    VAlert: { variant: 'tonal', rounded: 'lg' },
  },
})
