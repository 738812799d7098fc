// The analysis charts draw through the one lazily loaded ECharts set-up (src/plugins/echarts.ts).
export { VChart } from '../../plugins/chart'
