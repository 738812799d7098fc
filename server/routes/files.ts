import { Router } from 'express'
import { z } from 'zod'
import { requireSignedIn, requireRole, currentUser } from '../middleware/guards'
import { validate } from '../middleware/validate'
import { uploadFile, uploadedFile } from '../uploads'
import { userRateLimit } from '../middleware/user-rate-limit'
import { addCaseFile, caseFiles, checkCaseAcceptsFiles, openFile, requeueAnalysis } from '../services/files'

const idParam = z.object({ id: z.string().uuid() })

/** Uploads on a case (mounted under /cases) and downloads by file id (under /files). */
export function caseFilesRouter(): Router {
  const router = Router({ mergeParams: true })
  const uploads = userRateLimit('uploads')
  router.get('/:id/files', requireSignedIn, validate(idParam, 'params'), async (req, res) => res.json({ files: await caseFiles(currentUser(req), res.locals.params.id) }))
  // The case is checked before any byte is stored, so a stranger's upload never touches storage.
  router.post('/:id/files', requireSignedIn, validate(idParam, 'params'), uploads, async (req, _res, next) => {
    await checkCaseAcceptsFiles(currentUser(req), String(req.params.id))
    next()
  }, uploadFile(), async (req, res) =>
    res.status(201).json(await addCaseFile(currentUser(req), res.locals.params.id, uploadedFile(req))))
  return router
}

export function filesRouter(): Router {
  const router = Router()
  const send = (variant: 'original' | 'thumbnail') => async (req: import('express').Request, res: import('express').Response) => {
    const { row, stream, mime } = await openFile(currentUser(req), res.locals.params.id, variant)
    const inline = mime.startsWith('image/')
    res.setHeader('Content-Type', inline ? mime : row.kind === 'measurement' && mime.startsWith('text/') ? 'text/plain; charset=utf-8' : mime)
    res.setHeader('X-Content-Type-Options', 'nosniff')
    res.setHeader('Cache-Control', 'private, max-age=3600')
    res.setHeader('Content-Disposition', `${inline ? 'inline' : 'attachment'}; filename*=UTF-8''${encodeURIComponent(row.originalName)}`)
    stream.on('error', () => res.destroy())
    stream.pipe(res)
  }
  router.get('/:id', requireSignedIn, validate(idParam, 'params'), send('original'))
  router.get('/:id/thumbnail', requireSignedIn, validate(idParam, 'params'), send('thumbnail'))
  router.post('/:id/reanalyse', requireRole('advisor', 'supervisor'), validate(idParam, 'params'), async (req, res) => res.json(await requeueAnalysis(currentUser(req), res.locals.params.id)))
  return router
}
