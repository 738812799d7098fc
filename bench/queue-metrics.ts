/**
 * The supervisor's metrics at 10 000 cases: invented history (server/seed/steps/0003-history.ts)
 * into the bench database (DATABASE_URL, else a throwaway cluster: bench/lib/db.ts), then each GET /api/metrics/* service call timed over the whole
 * desk. Needs a throwaway database; the invented rows are removed afterwards.
 */
import { randomBytes } from 'node:crypto'

export interface Figure { name: string; value: number; unit: string; target?: string }

const CASES = 10_000

export async function run(): Promise<Figure[]> {
  const { benchDatabase } = await import('./lib/db')
  await benchDatabase()
  const { migrateUp } = await import('../server/db/migrate')
  const { closeDb } = await import('../server/db/sequelize')
  const { insertHistory } = await import('../server/seed/steps/0003-history')
  const metrics = await import('../server/services/metrics')
  await migrateUp()

  const tag = `bench-${randomBytes(4).toString('hex')}`
  const figures: Figure[] = []
  const t0 = performance.now()
  const { listenerIds } = await insertHistory({ cases: CASES, weeks: 12, listeners: 500, tag, seed: 11 })
  figures.push({ name: `insert ${CASES} cases with events`, value: (performance.now() - t0) / 1000, unit: 's' })
  const { models } = await import('../server/db/models')
  const { Op } = await import('sequelize')
  const n = await models().CaseEvent.count()
  figures.push({ name: 'case events in the database', value: n, unit: 'rows' })

  const calls: [string, () => Promise<unknown>][] = [
    ['status', () => metrics.casesByStatus({})],
    ['waiting', () => metrics.waitingTimes({})],
    ['response-times', () => metrics.responseTimes({})],
    ['breaches', () => metrics.breaches({})],
    ['workload', () => metrics.workload({})],
    ['reopen-rate', () => metrics.reopenRate({})],
    ['flags', () => metrics.flags({})],
    ['satisfaction', () => metrics.satisfaction({})],
  ]
  const timeAll = async (label: string) => {
    for (const [name, call] of calls) {
      await call()
      const times: number[] = []
      for (let i = 0; i < 5; i++) {
        const s = performance.now()
        await call()
        times.push(performance.now() - s)
      }
      times.sort((a, b) => a - b)
      figures.push({ name: `${name}${label} (median of 5)`, value: times[2], unit: 'ms', target: '< 500 ms' })
    }
  }
  try {
    const before = await metrics.getTargets()
    await timeAll('')
    // The same with business hours, so working time is computed per case in SQL.
    const day = { start: '09:00', end: '17:30' }
    await metrics.setTargets({ id: listenerIds[0], email: '', name: 'bench', role: 'supervisor' }, {
      firstResponseHours: 8, resolutionHours: 40, warnAtPercent: 75, businessHours: { timeZone: 'Europe/Amsterdam', week: [day, day, day, day, day, null, null] },
    }).catch(() => undefined)
    const t = await metrics.getTargets()
    if (t.businessHours) {
      await timeAll(', business hours')
      const { updatedAt: _a, updatedBy: _b, ...previous } = before
      await metrics.setTargets({ id: listenerIds[0], email: '', name: 'bench', role: 'supervisor' }, previous)
    }
  } finally {
    await models().AuditLog.destroy({ where: { actorId: listenerIds } })
    await models().User.destroy({ where: { [Op.or]: [{ id: listenerIds }, { email: { [Op.like]: `${tag}-%` } }] } })
    await closeDb()
  }
  return figures
}
