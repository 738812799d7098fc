import { defineConfig } from 'vitest/config'
import vue from '@vitejs/plugin-vue'
import vuetify from 'vite-plugin-vuetify'

const apiPort = Number(process.env.PORT ?? 3000)

export default defineConfig({
  plugins: [vue(), vuetify({ autoImport: true })],
  build: {
    outDir: 'dist',
    emptyOutDir: true,
    chunkSizeWarningLimit: 2000,
    rolldownOptions: {
      output: {
        // ECharts and its Vue wrapper in a chunk of their own, fetched by the first chart (src/plugins/chart.ts)
        // or beside a page that draws one on its first screen (withCharts in src/router/routes.ts), never by
        // the other pages. Grouping Vuetify and the app's shared code into a few large files as well cut a cold
        // page's requests from ~65 to ~25 but made the browser run more script on every page (bench/pages.ts,
        // main-thread work), so the rest keeps Rolldown's split by which pages use each module.
        codeSplitting: {
          // The group takes its own modules only (not everything they import), so Vue stays out of 'charts'.
          includeDependenciesRecursively: false,
          groups: [
            { name: 'charts', test: /node_modules[\\/](echarts|zrender|vue-echarts|tslib)[\\/]|src[\\/]plugins[\\/]echarts\.ts$/, priority: 30 },
          ],
        },
      },
    },
  },
  server: {
    proxy: {
      '/api': `http://127.0.0.1:${apiPort}`,
      '/socket.io': { target: `http://127.0.0.1:${apiPort}`, ws: true },
    },
  },
  test: {
    environment: 'node',
    include: ['tests/**/*.test.ts'],
    testTimeout: 60_000,
    hookTimeout: 60_000,
    // expect.poll waits for a page or the server to catch up; vitest's 1 s default is shorter than one
    // request takes on a loaded 2-core machine, so a poll without its own timeout failed at random.
    expect: { poll: { timeout: 15_000 } },
    maxWorkers: 2,
    globalSetup: ['tests/helpers/global-setup.ts'],
    setupFiles: ['tests/helpers/per-file-db.ts'],
    server: { deps: { inline: ['vuetify'] } },
  },
})
