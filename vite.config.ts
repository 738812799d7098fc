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
        // A few larger files instead of one per shared set of modules: a cold page load fetched 45–80
        // files over HTTP/1.1's six connections per host, and the queueing cost more than the bytes
        // (bench/pages.ts). Vue, the router, Pinia, zod and the Vuetify components the app uses (tree-shaken
        // by vite-plugin-vuetify) are needed by every page; the charts only by the pages that draw one;
        // the app's own code shared by two or more pages goes in one file, each page's own code stays in its chunk.
        codeSplitting: {
          // Each group takes its own modules only (not everything they import), so Vue stays in 'framework'.
          includeDependenciesRecursively: false,
          groups: [
            { name: 'charts', test: /node_modules[\\/](echarts|zrender|vue-echarts|tslib)[\\/]|src[\\/]plugins[\\/]echarts\.ts$/, priority: 30 },
            { name: 'live', test: /node_modules[\\/](socket\.io-client|socket\.io-parser|engine\.io-client|engine\.io-parser|@socket\.io)[\\/]/, priority: 25 },
            { name: 'framework', test: /node_modules[\\/](vue|@vue|vue-router|pinia|vuetify|@vuetify|@mdi|zod)[\\/]/, priority: 20 },
            { name: 'common', test: /[\\/](src|shared)[\\/]/, minShareCount: 2, priority: 10 },
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
