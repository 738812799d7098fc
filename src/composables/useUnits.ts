import { computed, ref, watch } from 'vue'
import { METRES_PER_FOOT, METRES_PER_INCH } from '../../shared/acoustics'
import { useAuthStore } from '../stores/auth'
import { getPreferences, setPreferences } from '../api/account'

export type UnitSystem = 'metric' | 'imperial'

const storageKey = (userId: string) => `rw.units.${userId}`
let loadedFor: Promise<UnitSystem | null> | undefined

function readChoice(userId: string | undefined): UnitSystem {
  if (!userId) return 'metric'
  try {
    return localStorage.getItem(storageKey(userId)) === 'imperial' ? 'imperial' : 'metric'
  } catch {
    return 'metric'
  }
}

const round = (value: number, step: number) => Math.round(value / step) * step
const trim = (value: number, decimals: number) => String(Number(value.toFixed(decimals)))

/** A length in metres as the listener reads it: `4.25 m`, or `13 ft 11.25 in` / `7.5 in` below a foot. */
export function formatLength(metres: number, units: UnitSystem, opts: { decimals?: number; unit?: boolean } = {}): string {
  if (!Number.isFinite(metres)) return '–'
  const unit = opts.unit !== false
  if (units === 'metric') return `${trim(metres, opts.decimals ?? 2)}${unit ? ' m' : ''}`
  const sign = metres < 0 ? '−' : ''
  const totalInches = round(Math.abs(metres) / METRES_PER_INCH, 0.25)
  let feet = Math.floor(totalInches / 12 + 1e-9)
  let inches = round(totalInches - feet * 12, 0.25)
  if (inches >= 12) {
    feet += 1
    inches = 0
  }
  if (feet === 0) return `${sign}${trim(inches, 2)} in`
  return inches === 0 ? `${sign}${feet} ft` : `${sign}${feet} ft ${trim(inches, 2)} in`
}

/** The text a length field starts from: `4.25` in metric, `13 ft 11.25 in` in imperial. */
export function lengthFieldText(metres: number, units: UnitSystem): string {
  if (!Number.isFinite(metres)) return ''
  return units === 'metric' ? trim(metres, 2) : formatLength(metres, units)
}

const FEET = /(-?\d+(?:[.,]\d+)?)\s*(?:ft|feet|foot|')/i
const INCHES = /(-?\d+(?:[.,]\d+)?)\s*(?:inches|inch|in|"|'')/i
const NUMBER = /^-?\d+(?:[.,]\d*)?$|^-?[.,]\d+$/

/**
 * What a listener typed into a length field, in metres, or null when it is not a length.
 * Metric: a number of metres (`4.25`, `4,25`, `425 cm`). Imperial: `13 ft 6 in`, `13' 6"`, `13'6`, `162 in`,
 * or a plain number of feet (`13.5`).
 */
export function parseLength(text: string, units: UnitSystem): number | null {
  const value = text.trim().replace(/\s+/g, ' ')
  if (!value) return null
  const num = (s: string) => Number(s.replace(',', '.'))
  if (units === 'metric') {
    const cm = /^(-?\d+(?:[.,]\d+)?)\s*cm$/i.exec(value)
    if (cm) return num(cm[1]) / 100
    const mm = /^(-?\d+(?:[.,]\d+)?)\s*mm$/i.exec(value)
    if (mm) return num(mm[1]) / 1000
    const m = /^(-?\d+(?:[.,]\d*)?|-?[.,]\d+)\s*m?$/i.exec(value)
    return m ? num(m[1]) : null
  }
  if (NUMBER.test(value)) return num(value) * METRES_PER_FOOT
  const feet = FEET.exec(value)
  const rest = feet ? value.slice(0, feet.index) + value.slice(feet.index + feet[0].length) : value
  const inches = INCHES.exec(rest)
  let leftover = inches ? rest.slice(0, inches.index) + rest.slice(inches.index + inches[0].length) : rest
  leftover = leftover.trim()
  // `13' 6` — a bare number after the feet counts as inches.
  let bareInches = 0
  if (feet && !inches && NUMBER.test(leftover)) {
    bareInches = num(leftover)
    leftover = ''
  }
  if (leftover || (!feet && !inches)) return null
  const ft = feet ? num(feet[1]) : 0
  const inch = inches ? num(inches[1]) : bareInches
  return ft * METRES_PER_FOOT + inch * METRES_PER_INCH
}

/**
 * A validation message (the shared schemas speak metres: "x = 7.2 m lies beyond the length 6.35 m")
 * in the reader's unit: every "<number> m" becomes feet and inches in imperial; metric is unchanged.
 */
export function messageInUnits(message: string, units: UnitSystem): string {
  if (units === 'metric') return message
  return message
    .replace(/(-?\d+(?:\.\d+)?) m\b(?![²³])/g, (_, n: string) => formatLength(Number(n), units))
    .replace(/a number of metres/g, 'a length')
}

/** What a bare number in a length field means, and the other forms it takes. */
export function lengthFieldHint(units: UnitSystem): string {
  return units === 'metric'
    ? 'A plain number is metres; 425 cm and 4250 mm work too.'
    : 'A plain number is feet; 12\' 6", 12 ft 6 in, 12.5 ft and 150 in work too.'
}

const SQ_FT_PER_M2 = 1 / (METRES_PER_FOOT * METRES_PER_FOOT)

export function formatArea(m2: number, units: UnitSystem): string {
  return units === 'metric' ? `${trim(m2, 1)} m²` : `${trim(m2 * SQ_FT_PER_M2, 0)} ft²`
}

export function formatVolume(m3: number, units: UnitSystem): string {
  return units === 'metric' ? `${trim(m3, 1)} m³` : `${trim(m3 / METRES_PER_FOOT ** 3, 0)} ft³`
}

export function formatTemperature(celsius: number, units: UnitSystem): string {
  return units === 'metric' ? `${trim(celsius, 1)} °C` : `${trim((celsius * 9) / 5 + 32, 0)} °F`
}

/** Area in the listener's unit (m² or ft²) ↔ m². */
export const areaToDisplay = (m2: number, units: UnitSystem) => (units === 'metric' ? m2 : m2 * SQ_FT_PER_M2)
export const areaFromDisplay = (value: number, units: UnitSystem) => (units === 'metric' ? value : value / SQ_FT_PER_M2)
/** Temperature in the listener's unit (°C or °F) ↔ °C. */
export const temperatureToDisplay = (celsius: number, units: UnitSystem) => (units === 'metric' ? celsius : (celsius * 9) / 5 + 32)
export const temperatureFromDisplay = (value: number, units: UnitSystem) => (units === 'metric' ? value : ((value - 32) * 5) / 9)

/**
 * The signed-in user's choice of metric or imperial, remembered in this browser per user
 * (`rw.units.<userId>`). The model stays in metres; convert only at inputs and displayed lengths.
 */
export function useUnits() {
  const auth = useAuthStore()
  const units = ref<UnitSystem>(readChoice(auth.user?.id))

  watch(
    () => auth.user?.id,
    (id) => {
      units.value = readChoice(id)
      if (id) adoptAccountChoice(id)
    },
  )
  if (auth.user?.id) adoptAccountChoice(auth.user.id)

  /** The account's stored choice wins over this browser's, once per page load. */
  function adoptAccountChoice(id: string) {
    loadedFor ??= getPreferences().then((p) => p.units).catch(() => null)
    void loadedFor.then((choice) => {
      if (!choice || auth.user?.id !== id) return
      units.value = choice
      try {
        localStorage.setItem(storageKey(id), choice)
      } catch {
        /* ignore */
      }
    })
  }

  function setUnits(value: UnitSystem): void {
    units.value = value
    const id = auth.user?.id
    if (!id) return
    try {
      localStorage.setItem(storageKey(id), value)
    } catch {
      // Private mode or full storage: the choice lasts for this page only.
    }
    // Kept on the account too, so the choice follows the person to another browser.
    void setPreferences({ units: value }).catch(() => {})
  }

  const system = computed({ get: () => units.value, set: setUnits })

  return {
    units: system,
    setUnits,
    lengthUnit: computed(() => (units.value === 'metric' ? 'm' : 'ft')),
    areaUnit: computed(() => (units.value === 'metric' ? 'm²' : 'ft²')),
    temperatureUnit: computed(() => (units.value === 'metric' ? '°C' : '°F')),
    length: (metres: number, opts?: { decimals?: number; unit?: boolean }) => formatLength(metres, units.value, opts),
    area: (m2: number) => formatArea(m2, units.value),
    volume: (m3: number) => formatVolume(m3, units.value),
    temperature: (celsius: number) => formatTemperature(celsius, units.value),
  }
}
