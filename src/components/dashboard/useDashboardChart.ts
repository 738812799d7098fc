import { computed } from 'vue'
import { useChartColors } from '../analysis/useChartColors'
import type { Column } from './csv'
import { weekLabel } from './format'

/** The shared look of the dashboard's charts (theme colours, axes, tooltip), so each chart states only its data. */
export function useDashboardChart() {
  const colors = useChartColors()
  const base = computed(() => {
    const c = colors.value
    const axis = { color: c.text, fontSize: 11 }
    return {
      colors: c,
      frame: {
        animation: false,
        textStyle: { fontFamily: 'Lato, system-ui, sans-serif' },
        tooltip: { trigger: 'axis', confine: true },
        legend: { top: 0, textStyle: { color: c.text } },
        grid: { left: 52, right: 20, top: 34, bottom: 36, containLabel: true },
      },
      category: (data: string[]) => ({ type: 'category', data, axisLabel: { ...axis, hideOverlap: true, interval: data.length <= 8 ? 0 : 'auto' }, axisLine: { lineStyle: { color: c.grid } } }),
      value: (name: string, extra: object = {}) => ({
        type: 'value', name, nameTextStyle: { color: c.muted }, axisLabel: axis, splitLine: { lineStyle: { color: c.grid } }, ...extra,
      }),
    }
  })
  return base
}

type ChartBase = ReturnType<typeof useDashboardChart>['value']

/**
 * A chart of weekly figures: the shared frame and a week axis labelled in `timeZone` (the zone the weeks
 * were counted in); `build` adds the chart's own axes and series.
 */
export function useWeeklyChart<W extends { weekStart: string }>(weeks: () => W[], timeZone: () => string | undefined, build: (b: ChartBase, w: W[]) => object) {
  const chart = useDashboardChart()
  return computed(() => {
    const b = chart.value
    const w = weeks()
    return { ...b.frame, xAxis: b.category(w.map((x) => weekLabel(x.weekStart, timeZone()))), ...build(b, w) }
  })
}

/** The CSV column of a weekly table: the week's first day as an ISO date (machine-readable, no zone words). */
export const weekColumn = <W extends { weekStart: string }>(): Column<W> => ({ key: 'week', title: 'Week starting', value: (x) => new Date(x.weekStart).toISOString().slice(0, 10) })
