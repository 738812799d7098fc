import { z } from 'zod'

/** Words accepted for a yes/no setting; anything else stops the start with the variable's name. */
const TRUE_WORDS = ['true', '1', 'yes', 'on']
const FALSE_WORDS = ['false', '0', 'no', 'off']

/**
 * A yes/no variable, read strictly: true/false, 1/0, yes/no (and on/off), any letter case; unset or
 * empty takes the default. (z.coerce.boolean() would read every non-empty string, "false" and "0"
 * included, as true.)
 */
function flag(name: string, fallback: boolean) {
  return z
    .string()
    .optional()
    .transform((v, ctx) => {
      if (v === undefined || v.trim() === '') return fallback
      const w = v.trim().toLowerCase()
      if (TRUE_WORDS.includes(w)) return true
      if (FALSE_WORDS.includes(w)) return false
      ctx.addIssue({ code: 'custom', message: `${name} must be one of true/false, 1/0, yes/no (got "${v}")` })
      return z.NEVER
    })
}

/** An on/off variable kept as 'on' | 'off' for the code that reads it, parsed as strictly as {@link flag}. */
const onOff = (name: string, fallback: 'on' | 'off') => flag(name, fallback === 'on').transform((b): 'on' | 'off' => (b ? 'on' : 'off'))

/**
 * A whole number in decimal digits only, within [min, max]; unset or empty takes the default.
 * (z.coerce.number() would take "" as 0, "0x50" as 80 and "1e3" as 1000.)
 */
function whole(name: string, fallback: number, min: number, max: number) {
  return z
    .string()
    .optional()
    .transform((v, ctx) => {
      if (v === undefined || v.trim() === '') return fallback
      if (!/^\d+$/.test(v.trim())) {
        ctx.addIssue({ code: 'custom', message: `${name} must be a whole number (got "${v}")` })
        return z.NEVER
      }
      const n = Number(v.trim())
      if (n < min || n > max) {
        ctx.addIssue({ code: 'custom', message: `${name} must be between ${min} and ${max} (got ${n})` })
        return z.NEVER
      }
      return n
    })
}

/** The development default of the inbound webhook's secret: public (it is in this file), so never accepted in production. */
export const DEV_INBOUND_SECRET = 'roomwright-development-inbound-secret'

/**
 * Every setting Roomwright reads from the environment, each with a default or marked required,
 * validated once at start-up: a bad value stops the process with a message naming the variable.
 */
const schema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  PORT: whole('PORT', 3000, 0, 65535),
  HOST: z.string().default('127.0.0.1'),
  DATABASE_URL: z
    .string({ error: 'DATABASE_URL is required (npm start provisions one for you)' })
    .refine((v) => /^postgres(ql)?:\/\/[^\s]+$/.test(v), 'DATABASE_URL must be a postgres:// URL'),
  SESSION_SECRET: z.string().min(16, 'SESSION_SECRET must be at least 16 characters').default('roomwright-development-session-secret'),
  PUBLIC_URL: z.string().url().optional(),
  TRUST_PROXY: flag('TRUST_PROXY', false),
  STORAGE_DRIVER: z.enum(['local', 's3']).default('local'),
  STORAGE_DIR: z.string().default('.data/storage'),
  S3_ENDPOINT: z.string().url().optional(),
  S3_BUCKET: z.string().optional(),
  S3_REGION: z.string().default('us-east-1'),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: whole('SMTP_PORT', 2525, 0, 65535),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  SMTP_SECURE: flag('SMTP_SECURE', false),
  MAIL_FROM: z.string().default('Roomwright <desk@roomwright.test>'),
  MAIL_REPLY_DOMAIN: z.string().default('reply.roomwright.test'),
  FAKE_SMTP: onOff('FAKE_SMTP', 'off'),
  INBOUND_EMAIL_SECRET: z.string().min(16, 'INBOUND_EMAIL_SECRET must be at least 16 characters').default(DEV_INBOUND_SECRET),
  JOBS: onOff('JOBS', 'on'),
  /**
   * Failed sign-ins allowed per account from one client address in SIGN_IN_WINDOW_MINUTES (successful ones do
   * not count); past it that address gets 429 for that account. Also where the account-wide back-off starts
   * (failures from all addresses together, auth/session.ts).
   */
  SIGN_IN_FAILURES_PER_ACCOUNT: whole('SIGN_IN_FAILURES_PER_ACCOUNT', 10, 1, 1_000_000),
  /** Failed password attempts allowed per client address in the window (high: one office shares an address). */
  LOGIN_RATE_LIMIT: whole('LOGIN_RATE_LIMIT', 100, 1, 1_000_000),
  SIGN_IN_WINDOW_MINUTES: whole('SIGN_IN_WINDOW_MINUTES', 15, 1, 24 * 60),
  /**
   * The longest wait (ms) before a sign-in attempt on an account that has SIGN_IN_FAILURES_PER_ACCOUNT or
   * more failures from all addresses in the window (auth/session.ts signInBackoffMs: 250 ms, doubling): a
   * back-off that slows guessing without locking the owner out. 0 turns it off.
   */
  SIGN_IN_BACKOFF_MAX_MS: whole('SIGN_IN_BACKOFF_MAX_MS', 5000, 0, 60_000),
  /**
   * Per signed-in user (middleware/user-rate-limit.ts), in USER_RATE_WINDOW_SECONDS, counted in PostgreSQL
   * across nodes; 429 with Retry-After past them. Generous for real use (SECURITY.md says why each); the
   * benches and `npm test` raise them through the environment only.
   */
  /** The window of the per-user limits, seconds (10 minutes by default; tests use a second or two). */
  USER_RATE_WINDOW_SECONDS: whole('USER_RATE_WINDOW_SECONDS', 600, 1, 24 * 3600),
  /** messages and notes posted (POST /api/cases/:id/messages) */
  MESSAGE_RATE_LIMIT: whole('MESSAGE_RATE_LIMIT', 120, 1, 10_000_000),
  /** files uploaded (POST /api/cases/:id/files) */
  UPLOAD_RATE_LIMIT: whole('UPLOAD_RATE_LIMIT', 120, 1, 10_000_000),
  /** engine previews of an unsaved room or plan (POST /api/rooms/preview, /api/plans/preview) */
  PREVIEW_RATE_LIMIT: whole('PREVIEW_RATE_LIMIT', 600, 1, 10_000_000),
  /** subwoofer searches, up to 20 s of a worker each (POST /api/rooms/subwoofers) */
  SUBWOOFER_RATE_LIMIT: whole('SUBWOOFER_RATE_LIMIT', 30, 1, 10_000_000),
  /** full-text searches of the queue (GET /api/cases?q=…) */
  SEARCH_RATE_LIMIT: whole('SEARCH_RATE_LIMIT', 900, 1, 10_000_000),
  /** room saves, each an engine run and a new revision (POST /api/rooms, PUT /api/rooms/:id) */
  ROOM_SAVE_RATE_LIMIT: whole('ROOM_SAVE_RATE_LIMIT', 120, 1, 10_000_000),
  /** plan reports made as PDF (GET /api/cases/:id/plans/:version/report.pdf) */
  REPORT_RATE_LIMIT: whole('REPORT_RATE_LIMIT', 60, 1, 10_000_000),
  /** Longest one SQL statement may run, ms: requests fail fast instead of piling up. Benchmarks raise it for bulk loads. */
  DB_STATEMENT_TIMEOUT_MS: whole('DB_STATEMENT_TIMEOUT_MS', 15_000, 1000, 3_600_000),
  /**
   * The longest a node answers a signed-in session from its memory (auth/session-store.ts); changes drop
   * it at once through the change feed, so this only bounds a lost notification. 0 turns the cache off.
   */
  SESSION_CACHE_SECONDS: whole('SESSION_CACHE_SECONDS', 10, 0, 3600),
})

export type Config = z.infer<typeof schema>

export class ConfigError extends Error {}

export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = schema.safeParse(env)
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => `  ${i.path.join('.') || '(environment)'}: ${i.message}`)
    throw new ConfigError(`Roomwright cannot start, the configuration is invalid:\n${lines.join('\n')}`)
  }
  const config = parsed.data
  if (config.NODE_ENV === 'production' && config.SESSION_SECRET === 'roomwright-development-session-secret') {
    throw new ConfigError('Roomwright cannot start: SESSION_SECRET must be set in production')
  }
  if (config.NODE_ENV === 'production' && (!env.INBOUND_EMAIL_SECRET?.trim() || config.INBOUND_EMAIL_SECRET === DEV_INBOUND_SECRET)) {
    throw new ConfigError('Roomwright cannot start: INBOUND_EMAIL_SECRET must be set in production to a secret of your own (at least 16 characters), not missing and not the development default')
  }
  if (config.STORAGE_DRIVER === 's3' && (!config.S3_BUCKET || !config.S3_ENDPOINT)) {
    throw new ConfigError('Roomwright cannot start: STORAGE_DRIVER=s3 needs S3_ENDPOINT and S3_BUCKET')
  }
  return config
}

let current: Config | undefined
/** The validated configuration of this process (loaded on first use). */
export function config(): Config {
  current ??= loadConfig()
  return current
}
export function setConfigForTests(c: Config): void {
  current = c
}
