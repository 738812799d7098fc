import { z } from 'zod'

/**
 * Every setting Roomwright reads from the environment, each with a default or marked required,
 * validated once at start-up: a bad value stops the process with a message naming the variable.
 */
/** The development default of the inbound webhook's secret: public (it is in this file), so never accepted in production. */
export const DEV_INBOUND_SECRET = 'roomwright-development-inbound-secret'

const schema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  PORT: z.coerce.number().int('PORT must be a whole number').min(0).max(65535, 'PORT must be at most 65535').default(3000),
  HOST: z.string().default('127.0.0.1'),
  DATABASE_URL: z
    .string({ error: 'DATABASE_URL is required (npm start provisions one for you)' })
    .refine((v) => /^postgres(ql)?:\/\/[^\s]+$/.test(v), 'DATABASE_URL must be a postgres:// URL'),
  SESSION_SECRET: z.string().min(16, 'SESSION_SECRET must be at least 16 characters').default('roomwright-development-session-secret'),
  PUBLIC_URL: z.string().url().optional(),
  TRUST_PROXY: z.coerce.boolean().default(false),
  STORAGE_DRIVER: z.enum(['local', 's3']).default('local'),
  STORAGE_DIR: z.string().default('.data/storage'),
  S3_ENDPOINT: z.string().url().optional(),
  S3_BUCKET: z.string().optional(),
  S3_REGION: z.string().default('us-east-1'),
  S3_ACCESS_KEY_ID: z.string().optional(),
  S3_SECRET_ACCESS_KEY: z.string().optional(),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  SMTP_SECURE: z.coerce.boolean().default(false),
  MAIL_FROM: z.string().default('Roomwright <desk@roomwright.test>'),
  MAIL_REPLY_DOMAIN: z.string().default('reply.roomwright.test'),
  FAKE_SMTP: z.enum(['on', 'off']).default('off'),
  INBOUND_EMAIL_SECRET: z.string().min(16, 'INBOUND_EMAIL_SECRET must be at least 16 characters').default(DEV_INBOUND_SECRET),
  JOBS: z.enum(['on', 'off']).default('on'),
  LOGIN_RATE_LIMIT: z.coerce.number().int().positive().default(20),
  /** Longest one SQL statement may run, ms: requests fail fast instead of piling up. Benchmarks raise it for bulk loads. */
  DB_STATEMENT_TIMEOUT_MS: z.coerce.number().int().min(1000).max(3_600_000).default(15_000),
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
