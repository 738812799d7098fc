import { describe, expect, it } from 'vitest'
import { DatabaseError, ConnectionRefusedError } from 'sequelize'
import { isDatabaseUnavailable } from '../../../server/middleware/errors'

/** node-postgres' error when the server goes away mid-query carries no SQLSTATE, only this message. */
const terminated = () => Object.assign(new Error('Connection terminated unexpectedly'), {})

describe('isDatabaseUnavailable — which errors answer 503 rather than 500', () => {
  it('a query cut off by a server shutdown, wrapped by Sequelize, is an outage', () => {
    const wrapped = new DatabaseError(terminated() as never)
    expect(isDatabaseUnavailable(wrapped)).toBe(true)
  })
  it('SQLSTATE 57P01 (admin shutdown) and class 08 (connection exception) are outages (PostgreSQL manual, appendix A)', () => {
    expect(isDatabaseUnavailable(new DatabaseError(Object.assign(new Error('terminating connection due to administrator command'), { code: '57P01' }) as never))).toBe(true)
    expect(isDatabaseUnavailable(Object.assign(new Error('x'), { code: '08006' }))).toBe(true)
    expect(isDatabaseUnavailable(new ConnectionRefusedError(new Error('connect ECONNREFUSED')))).toBe(true)
  })
  it('an ordinary query error (a unique violation, 23505) is not an outage', () => {
    expect(isDatabaseUnavailable(new DatabaseError(Object.assign(new Error('duplicate key'), { code: '23505' }) as never))).toBe(false)
    expect(isDatabaseUnavailable(new Error('something else'))).toBe(false)
    expect(isDatabaseUnavailable(null)).toBe(false)
  })
})
