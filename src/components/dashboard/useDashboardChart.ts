import { computed } from 'vue'
import { useChartColors } from '../analysis/useChartColors'

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
