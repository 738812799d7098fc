import { Router } from 'express'
import { db } from '../db/sequelize'

export function healthRouter(): Router {
  const router = Router()
  router.get('/', async (_req, res) => {
    try {
      await db().authenticate()
      res.json({ ok: true, db: 'up' })
    } catch {
      res.status(503).json({ ok: false, db: 'down' })
    }
  })
  return router
}
