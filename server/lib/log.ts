/** Structured one-line logs on stderr; quiet in tests unless LOG_LEVEL=debug. */
type Level = 'debug' | 'info' | 'warn' | 'error'
const order: Record<Level, number> = { debug: 10, info: 20, warn: 30, error: 40 }
const threshold = (): number => order[(process.env.LOG_LEVEL as Level) ?? (process.env.NODE_ENV === 'test' ? 'error' : 'info')] ?? 20

function write(level: Level, message: string, fields?: Record<string, unknown>) {
  if (order[level] < threshold()) return
  process.stderr.write(JSON.stringify({ t: new Date().toISOString(), level, message, ...fields }) + '\n')
}

export const log = {
  debug: (m: string, f?: Record<string, unknown>) => write('debug', m, f),
  info: (m: string, f?: Record<string, unknown>) => write('info', m, f),
  warn: (m: string, f?: Record<string, unknown>) => write('warn', m, f),
  error: (m: string, f?: Record<string, unknown>) => write('error', m, f),
}
