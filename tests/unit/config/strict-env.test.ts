import { describe, expect, it } from 'vitest'
import { ConfigError, loadConfig } from '../../../server/config'

const BASE = { DATABASE_URL: 'postgres://u@127.0.0.1/db' }
const load = (extra: Record<string, string>) => loadConfig({ ...BASE, ...extra })

const FLAGS = ['TRUST_PROXY', 'SMTP_SECURE'] as const
const ON_OFF = ['FAKE_SMTP', 'JOBS'] as const
const NUMBERS: { name: string; min: number; max: number }[] = [
  { name: 'PORT', min: 0, max: 65535 },
  { name: 'SMTP_PORT', min: 0, max: 65535 },
  { name: 'LOGIN_RATE_LIMIT', min: 1, max: 1_000_000 },
  { name: 'SIGN_IN_FAILURES_PER_ACCOUNT', min: 1, max: 1_000_000 },
  { name: 'SIGN_IN_WINDOW_MINUTES', min: 1, max: 1440 },
  { name: 'DB_STATEMENT_TIMEOUT_MS', min: 1000, max: 3_600_000 },
  { name: 'SIGN_IN_BACKOFF_MAX_MS', min: 0, max: 60_000 },
  { name: 'USER_RATE_WINDOW_SECONDS', min: 1, max: 86_400 },
  ...['MESSAGE', 'UPLOAD', 'PREVIEW', 'SUBWOOFER', 'SEARCH', 'ROOM_SAVE', 'REPORT'].map((a) => ({ name: `${a}_RATE_LIMIT`, min: 1, max: 10_000_000 })),
]

describe('boolean settings are read strictly (true/false, 1/0, yes/no)', () => {
  for (const name of FLAGS) {
    it(`${name}: "false", "0", "no", "FALSE" read as false; "true", "1", "yes" as true`, () => {
      for (const v of ['false', '0', 'no', 'FALSE', ' No ']) expect(load({ [name]: v })[name], v).toBe(false)
      for (const v of ['true', '1', 'yes', 'TRUE', 'Yes']) expect(load({ [name]: v })[name], v).toBe(true)
    })
    it(`${name}: unset or empty is false (the default)`, () => {
      expect(load({})[name]).toBe(false)
      expect(load({ [name]: '' })[name]).toBe(false)
    })
    it(`${name}: anything else stops the start with a message naming ${name}`, () => {
      for (const v of ['flase', '2', 'enabled', 'y']) {
        expect(() => load({ [name]: v }), v).toThrow(ConfigError)
        expect(() => load({ [name]: v }), v).toThrow(new RegExp(`${name}: ${name} must be one of true/false`))
      }
    })
  }
  for (const name of ON_OFF) {
    it(`${name}: on/off and the same words as the flags; anything else names ${name}`, () => {
      for (const v of ['off', 'false', '0', 'no']) expect(load({ [name]: v })[name], v).toBe('off')
      for (const v of ['on', 'true', '1', 'yes']) expect(load({ [name]: v })[name], v).toBe('on')
      expect(() => load({ [name]: 'sometimes' })).toThrow(new RegExp(`${name}: ${name} must be one of`))
    })
  }
})

describe('number settings are whole decimal numbers within their range', () => {
  for (const { name, min, max } of NUMBERS) {
    it(`${name}: "${min}" and "${max}" are read as numbers`, () => {
      expect(load({ [name]: String(min) })[name as 'PORT']).toBe(min)
      expect(load({ [name]: String(max) })[name as 'PORT']).toBe(max)
    })
    it(`${name}: hex, exponent, fraction, sign and words stop the start with a message naming ${name}`, () => {
      for (const v of ['0x50', '1e3', '12.5', '-1', '+5', 'eighty', '3000abc']) {
        expect(() => load({ [name]: v }), v).toThrow(new RegExp(`${name}: ${name} must be a whole number`))
      }
    })
    it(`${name}: outside ${min}–${max} stops the start with a message naming ${name}`, () => {
      expect(() => load({ [name]: String(max + 1) })).toThrow(new RegExp(`${name}: ${name} must be between ${min} and ${max}`))
      if (min > 0) expect(() => load({ [name]: String(min - 1) })).toThrow(new RegExp(`${name}: ${name} must be between`))
    })
  }
})
