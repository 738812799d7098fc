import { defineAsyncComponent } from 'vue'

/**
 * ECharts and its Vue wrapper (the largest part of the client) in a chunk of their own, fetched when the
 * first chart mounts, so a page without a chart never loads it and a page with one is drawn while it comes.
 * Pages whose first screen has a chart start the fetch with the page itself (`withCharts` in the routes).
 */
export const loadCharts = () => import('./echarts')

export const VChart = defineAsyncComponent(loadCharts)
