import { AnalysisFailedError, runSubwooferSearch } from '../analysis/service'
import { AppError, badRequest } from '../errors'
import type { Room } from '../../shared/schemas/room'
import type { SubwooferAdvice } from '../../shared/acoustics'
import { checkMaterials } from './rooms'

/**
 * Where one, two or four subwoofers should stand for every seat of a room as described (saved or
 * not): validated here, searched in the worker pool.
 */
export async function searchRoomSubwoofers(room: Room, counts: number[]): Promise<SubwooferAdvice> {
  checkMaterials(room)
  try {
    return await runSubwooferSearch({ room, counts })
  } catch (err) {
    if (err instanceof AnalysisFailedError) throw new AppError('The subwoofer search could not finish just now; try again in a moment', { status: 503, code: err.code })
    if (err instanceof Error && err.name === 'RangeError') throw badRequest(err.message)
    throw err
  }
}
