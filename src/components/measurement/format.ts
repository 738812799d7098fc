/** Frequencies as the trade writes them: 63 Hz, 1 kHz, 12.5 kHz. */
export function hz(value: number): string {
  if (value >= 1000) return `${Number((value / 1000).toFixed(value >= 10_000 ? 1 : 2))} kHz`
  return `${Number(value.toFixed(value < 100 ? 1 : 0))} Hz`
}

export function seconds(value: number | null | undefined): string {
  return value === null || value === undefined ? '–' : `${value.toFixed(2)} s`
}

export function db(value: number | null | undefined, digits = 1): string {
  if (value === null || value === undefined || !Number.isFinite(value)) return '–'
  return `${value > 0 ? '+' : value < 0 ? '−' : ''}${Math.abs(value).toFixed(digits)} dB`
}

export function ms(value: number | null | undefined, digits = 1): string {
  return value === null || value === undefined ? '–' : `${value.toFixed(digits)} ms`
}

/** A logarithmic frequency axis as the trade draws it, with minor grid lines between the decades. */
export function logFrequencyAxis(minHz: number, maxHz: number) {
  return {
    type: 'log' as const,
    logBase: 10,
    min: minHz,
    max: maxHz,
    name: 'Hz',
    nameGap: 8,
    minorTick: { show: true, splitNumber: 9 },
    minorSplitLine: { show: true, lineStyle: { opacity: 0.35 } },
    axisLabel: { showMaxLabel: false, formatter: (v: number) => (v >= 1000 ? `${Number((v / 1000).toFixed(1))}k` : String(Math.round(v))) },
  }
}
