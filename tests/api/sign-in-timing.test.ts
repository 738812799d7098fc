import { afterAll, describe, expect, it } from 'vitest'
import { performance } from 'node:perf_hooks'
import bcrypt from 'bcryptjs'
import { client, closeTestApp, makeUser, uniqueEmail } from '../helpers/api'
import { bcryptRounds, hashPassword, verifyCredentials } from '../../server/services/auth'
import { insertUser } from '../../server/data/users'

afterAll(closeTestApp)

const median = (xs: number[]) => { const s = [...xs].sort((a, b) => a - b); return s[Math.floor(s.length / 2)] }

describe('sign-in answers alike whether or not the e-mail has an account', () => {
  it('known e-mail with a wrong password and an unknown e-mail: same status, same body', async () => {
    const user = await makeUser('listener')
    const c = await client()
    const known = await c.post('/api/auth/login', { email: user.email, password: 'not-the-password-41' }).expect(401)
    const unknown = await c.post('/api/auth/login', { email: uniqueEmail('nobody'), password: 'not-the-password-41' }).expect(401)
    expect(unknown.body).toEqual(known.body)
  })

  // Not a wall-clock bound: the ratio of the two medians, with the production cost factor (12), so the
  // real hash and the decoy are compared at the cost an attacker would time. A decoy of cost 10 against
  // real hashes of cost 12 gives a ratio near 4 (2² times the work); equal costs give a ratio near 1.
  it('with the production cost factor, the median time of the two paths differs by less than a factor 1.6', async () => {
    const before = process.env.NODE_ENV
    process.env.NODE_ENV = 'production'
    try {
      expect(bcryptRounds()).toBe(12)
      const stored = await insertUser({ email: uniqueEmail('timed'), name: 'Timed listener', role: 'listener', passwordHash: await hashPassword('a-long-real-password-93') })
      expect(bcrypt.getRounds(stored.passwordHash!)).toBe(12)
      const knownMs: number[] = []
      const unknownMs: number[] = []
      const time = async (email: string) => { const t = performance.now(); expect(await verifyCredentials(email, 'wrong-password-for-sure-7')).toBeNull(); return performance.now() - t }
      await time(uniqueEmail('warm')) // the decoy of this cost factor is made on first use
      for (let i = 0; i < 7; i++) {
        knownMs.push(await time(stored.email))
        unknownMs.push(await time(uniqueEmail('unknown')))
      }
      const ratio = median(knownMs) / median(unknownMs)
      expect(ratio, `medians ${median(knownMs).toFixed(0)} ms (known) vs ${median(unknownMs).toFixed(0)} ms (unknown)`).toBeGreaterThan(1 / 1.6)
      expect(ratio).toBeLessThan(1.6)
    } finally {
      process.env.NODE_ENV = before
    }
  }, 120_000)
})
