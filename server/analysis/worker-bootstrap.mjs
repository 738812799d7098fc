// Piscina loads this plain-JavaScript entry in each worker thread; it registers tsx
// for the thread and re-exports the TypeScript worker's handler.
import { tsImport } from 'tsx/esm/api'

const worker = await tsImport('./worker.ts', import.meta.url)

export default worker.default
export const engine = worker.engine
export const subwooferSearch = worker.subwooferSearch
