/** `npm run dev`: the API server (as npm start, without the client build) and Vite's dev server with /api proxied. */
import { spawn } from 'node:child_process'

const api = spawn(process.execPath, ['--import', 'tsx', 'server/dev/start.ts', '--no-client'], { stdio: 'inherit', env: process.env })
const vite = spawn(process.execPath, ['node_modules/vite/bin/vite.js'], { stdio: 'inherit', env: process.env })
const stop = () => {
  vite.kill('SIGINT')
  api.kill('SIGINT')
}
process.on('SIGINT', stop)
process.on('SIGTERM', stop)
api.on('exit', (code) => {
  vite.kill('SIGINT')
  process.exit(code ?? 0)
})
