import { describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { addWorkingMs, elapsedHours, workingMs, zoneOffsetMs } from '../../server/services/business-hours'
import { businessHoursSchema, type BusinessHours } from '../../shared/schemas/metrics'

const H = 3_600_000
const nineToFive = { start: '09:00', end: '17:00' }
const officeWeek = (timeZone: string): BusinessHours => ({ timeZone, week: [nineToFive, nineToFive, nineToFive, nineToFive, nineToFive, null, null] })
const allDay = { start: '00:00', end: '24:00' }
const everyHour = (timeZone: string): BusinessHours => ({ timeZone, week: Array(7).fill(allDay) })
const hours = (a: string, b: string, bh: BusinessHours) => workingMs(new Date(a), new Date(b), bh) / H

// Clock changes used below: the EU changes on the last Sunday of March and October at 01:00 UTC
// (Directive 2000/84/EC); the US on the second Sunday of March and the first Sunday of November at
// 02:00 local time (Energy Policy Act of 2005, sec. 110). Both as held in the IANA tz database.
describe('workingMs — a Monday-to-Friday 09:00–17:00 week in Europe/Berlin', () => {
  const berlin = officeWeek('Europe/Berlin')
  it('inside one working day: the plain difference', () => {
    // 2025-03-04 is a Tuesday; Berlin is UTC+1 in winter, so 10:15 local is 09:15Z.
    expect(hours('2025-03-04T09:15:00Z', '2025-03-04T12:45:00Z', berlin)).toBeCloseTo(3.5, 9)
  })
  it('overnight: Tuesday 16:00 to Wednesday 10:00 local counts 1 h + 1 h', () => {
    expect(hours('2025-03-04T15:00:00Z', '2025-03-05T09:00:00Z', berlin)).toBeCloseTo(2, 9)
  })
  it('over a week-end: Friday 16:30 to Monday 09:45 local counts 0.5 h + 0.75 h', () => {
    expect(hours('2025-03-07T15:30:00Z', '2025-03-10T08:45:00Z', berlin)).toBeCloseTo(1.25, 9)
  })
  it('entirely in a week-end or a night: zero', () => {
    expect(hours('2025-03-08T08:00:00Z', '2025-03-09T20:00:00Z', berlin)).toBe(0)
    expect(hours('2025-03-04T17:00:00Z', '2025-03-05T07:59:00Z', berlin)).toBe(0)
  })
  it('a whole week is 40 h, also the week clocks go forward (30 March 2025), which has 167 calendar hours', () => {
    expect(hours('2025-03-02T23:00:00Z', '2025-03-09T23:00:00Z', berlin)).toBeCloseTo(40, 9)
    const from = '2025-03-23T23:00:00Z' // Monday 24 March 00:00 CET
    const to = '2025-03-30T22:00:00Z' // Monday 31 March 00:00 CEST
    expect((Date.parse(to) - Date.parse(from)) / H).toBe(167)
    expect(hours(from, to, berlin)).toBeCloseTo(40, 9)
  })
  it('Friday 16:00 CET to Monday 10:00 CEST across the change: 2 working hours in 65 calendar hours', () => {
    const from = '2025-03-28T15:00:00Z'
    const to = '2025-03-31T08:00:00Z'
    expect((Date.parse(to) - Date.parse(from)) / H).toBe(65)
    expect(hours(from, to, berlin)).toBeCloseTo(2, 9)
  })
  it('the Monday after the change starts at 07:00Z, not 08:00Z', () => {
    expect(hours('2025-03-31T07:00:00Z', '2025-03-31T08:00:00Z', berlin)).toBeCloseTo(1, 9)
    expect(hours('2025-03-24T07:00:00Z', '2025-03-24T08:00:00Z', berlin)).toBe(0)
  })
  it('an interval that ends before it starts is zero', () => {
    expect(hours('2025-03-05T12:00:00Z', '2025-03-05T10:00:00Z', berlin)).toBe(0)
  })
})

describe('workingMs — clock changes in America/New_York', () => {
  it('round-the-clock hours equal calendar time across the spring change (the 9 March 2025 day has 23 h)', () => {
    expect(hours('2025-03-08T12:00:00Z', '2025-03-10T12:00:00Z', everyHour('America/New_York'))).toBeCloseTo(48, 9)
    expect(hours('2025-03-09T05:00:00Z', '2025-03-10T04:00:00Z', everyHour('America/New_York'))).toBeCloseTo(23, 9)
  })
  it('a Sunday 00:00–06:00 shift lasts 7 h on the day clocks go back (2 November 2025)', () => {
    const sundayEarly: BusinessHours = { timeZone: 'America/New_York', week: [null, null, null, null, null, null, { start: '00:00', end: '06:00' }] }
    expect(hours('2025-11-01T12:00:00Z', '2025-11-03T12:00:00Z', sundayEarly)).toBeCloseTo(7, 9)
    expect(hours('2025-10-25T12:00:00Z', '2025-10-27T12:00:00Z', sundayEarly)).toBeCloseTo(6, 9)
  })
  it('a start inside the spring-forward gap (02:30) is read with the offset before the change: 03:30 EDT', () => {
    const gap: BusinessHours = { timeZone: 'America/New_York', week: [null, null, null, null, null, null, { start: '02:30', end: '04:00' }] }
    expect(hours('2025-03-09T00:00:00Z', '2025-03-10T00:00:00Z', gap)).toBeCloseTo(0.5, 9)
  })
})

describe('workingMs — other zones', () => {
  it('half-hour offsets: Asia/Kolkata (UTC+5:30) opens at 03:30Z', () => {
    expect(hours('2025-03-03T00:00:00Z', '2025-03-03T06:00:00Z', officeWeek('Asia/Kolkata'))).toBeCloseTo(2.5, 9)
  })
  it('the same instants give different figures in zones where the week-end falls elsewhere', () => {
    // Friday 20:00Z to Saturday 02:00Z: Saturday morning in Auckland (UTC+13 in March), Friday afternoon in Los Angeles.
    expect(hours('2025-03-07T20:00:00Z', '2025-03-08T02:00:00Z', officeWeek('Pacific/Auckland'))).toBe(0)
    expect(hours('2025-03-07T20:00:00Z', '2025-03-08T02:00:00Z', officeWeek('America/Los_Angeles'))).toBeCloseTo(5, 9)
  })
  it('zone offsets come from the tz database: Berlin +1 h in January, +2 h in July', () => {
    expect(zoneOffsetMs(Date.parse('2025-01-15T12:00:00Z'), 'Europe/Berlin')).toBe(1 * H)
    expect(zoneOffsetMs(Date.parse('2025-07-15T12:00:00Z'), 'Europe/Berlin')).toBe(2 * H)
  })
})

describe('addWorkingMs and elapsedHours', () => {
  const berlin = officeWeek('Europe/Berlin')
  it('24 working hours from Thursday 15:00 local end on Tuesday 15:00 local', () => {
    expect(addWorkingMs(new Date('2025-03-06T14:00:00Z'), 24 * H, berlin).toISOString()).toBe('2025-03-11T14:00:00.000Z')
  })
  it('a clock started in the evening runs from the next morning', () => {
    expect(addWorkingMs(new Date('2025-03-04T19:00:00Z'), 1 * H, berlin).toISOString()).toBe('2025-03-05T09:00:00.000Z')
  })
  it('without business hours it is calendar time', () => {
    expect(addWorkingMs(new Date('2025-03-06T14:00:00Z'), 24 * H, null).toISOString()).toBe('2025-03-07T14:00:00.000Z')
    expect(elapsedHours(new Date('2025-03-06T14:00:00Z'), new Date('2025-03-07T02:00:00Z'), null)).toBe(12)
  })
})

describe('invariants (property-based)', () => {
  const zones = ['Europe/Berlin', 'America/New_York', 'Australia/Sydney', 'Asia/Kolkata', 'UTC']
  const instant = fc.integer({ min: Date.parse('2024-01-01T00:00:00Z'), max: Date.parse('2026-12-31T00:00:00Z') })
  const slot = fc.option(
    fc.tuple(fc.integer({ min: 0, max: 22 }), fc.integer({ min: 1, max: 24 })).map(([s, len]) => {
      const e = Math.min(24, s + len)
      const f = (h: number) => `${String(h).padStart(2, '0')}:00`
      return { start: f(s), end: f(e) }
    }),
  )
  const week = fc.record({ timeZone: fc.constantFrom(...zones), week: fc.array(slot, { minLength: 7, maxLength: 7 }) })
    .filter((w) => businessHoursSchema.safeParse(w).success) as fc.Arbitrary<BusinessHours>

  it('never more than calendar time, never negative, and additive over a split point', () => {
    fc.assert(
      fc.property(week, instant, fc.integer({ min: 0, max: 30 * 24 * H }), fc.double({ min: 0, max: 1, noNaN: true }), (bh, a, len, f) => {
        const b = a + len
        const m = Math.round(a + f * len)
        const whole = workingMs(a, b, bh)
        expect(whole).toBeGreaterThanOrEqual(0)
        expect(whole).toBeLessThanOrEqual(len)
        expect(workingMs(a, m, bh) + workingMs(m, b, bh)).toBeCloseTo(whole, 0)
      }),
      { numRuns: 300 },
    )
  })
  it('addWorkingMs is the inverse of workingMs', () => {
    fc.assert(
      fc.property(week, instant, fc.integer({ min: 1, max: 60 * H }), (bh, a, ms) => {
        const due = addWorkingMs(a, ms, bh)
        expect(workingMs(a, due, bh)).toBeCloseTo(ms, 0)
      }),
      { numRuns: 200 },
    )
  })
  it('does not change the hours it is given', () => {
    const bh = officeWeek('Europe/Berlin')
    const copy = structuredClone(bh)
    workingMs(0, Date.parse('2025-03-10T00:00:00Z'), bh)
    expect(bh).toEqual(copy)
  })
})
