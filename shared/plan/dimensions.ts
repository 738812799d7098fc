import type { Surface } from '../acoustics'
import type { PlanRoom } from './apply'
import { surfaceWords, m } from './names'

export interface Placement {
  surface: Surface
  /** the wall or corner the horizontal position is measured from, and the near edge's distance, metres */
  from: { name: string; m: number }
  /** the distance of the far edge from the opposite wall or corner, metres */
  to: { name: string; m: number }
  /** walls: bottom edge above the floor and top edge below the ceiling; floor/ceiling: edges from the left and right walls */
  low: { name: string; m: number }
  high: { name: string; m: number }
  /** one line for the fitter */
  text: string
}

type Rect = { surface: Surface; x: number; y: number; z: number; width: number; height: number }

/**
 * Where a treatment goes, measured from walls and corners: on a wall its near edge from the corner
 * (front and back walls from the left corner, side walls from the front corner), its far edge from the
 * other corner, its bottom edge above the floor and top edge below the ceiling; on the floor and the
 * ceiling its edges from the front and back walls and from the left and right walls.
 */
export function placement(room: Pick<PlanRoom, 'length' | 'width' | 'height'>, t: Rect): Placement {
  const { length: L, width: W, height: H } = room
  const r2 = (v: number) => Math.max(0, Math.round(v * 100) / 100)
  const wall = surfaceWords[t.surface]
  if (t.surface === 'floor' || t.surface === 'ceiling') {
    const from = { name: 'front wall', m: r2(t.x - t.width / 2) }
    const to = { name: 'back wall', m: r2(L - (t.x + t.width / 2)) }
    const low = { name: 'left wall', m: r2(t.y - t.height / 2) }
    const high = { name: 'right wall', m: r2(W - (t.y + t.height / 2)) }
    return { surface: t.surface, from, to, low, high, text: `${wall}: ${m(from.m)} from the front wall, ${m(to.m)} from the back wall; ${m(low.m)} from the left wall, ${m(high.m)} from the right wall` }
  }
  const alongY = t.surface === 'front' || t.surface === 'back'
  const c = alongY ? t.y : t.x
  const size = alongY ? W : L
  const nearName = alongY ? `left corner` : `front corner`
  const farName = alongY ? `right corner` : `back corner`
  const from = { name: nearName, m: r2(c - t.width / 2) }
  const to = { name: farName, m: r2(size - (c + t.width / 2)) }
  const low = { name: 'floor', m: r2(t.z - t.height / 2) }
  const high = { name: 'ceiling', m: r2(H - (t.z + t.height / 2)) }
  return { surface: t.surface, from, to, low, high, text: `${wall}: near edge ${m(from.m)} from the ${nearName}, far edge ${m(to.m)} from the ${farName}; bottom ${m(low.m)} above the floor, top ${m(high.m)} below the ceiling` }
}
