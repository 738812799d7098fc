import type { PlanBody } from '../schemas/plan'
import type { PlanRoom } from './apply'
import type { ChangePrediction, RtRule } from './predict'
import { placement } from './dimensions'
import { capitalise, m, mm, surfaceWords, treatmentTypeNames } from './names'
import { flagInSentence } from '../words/flags'

/** A flag's name inside a sentence, from the one list in shared/words/flags.ts ("seat close to a wall"). */
export const flagWords = (id: string): string => flagInSentence(id)
const flagList = (ids: string[]) => ids.map(flagWords).join(', ')

/** A heading for one change. */
export function changeTitle(room: PlanRoom, body: PlanBody, id: string): string {
  if (id === 'seat') return 'Move the main seat'
  if (id === 'speakers') return body.speakers.length === 1 ? `Move speaker ${body.speakers[0].label}` : `Move the speakers (${body.speakers.map((s) => s.label).join(', ')})`
  if (id === 'subwoofers') return body.subwoofers.length === 1 ? `Move subwoofer ${body.subwoofers[0].label}` : `Move the subwoofers (${body.subwoofers.map((s) => s.label).join(', ')})`
  const t = body.treatments.find((x) => x.id === id)
  if (!t) return id
  return `${capitalise(t.label || treatmentTypeNames[t.type] || t.type)} on the ${surfaceWords[t.surface]}`
}

function moveWords(from: { x: number; y: number }, to: { x: number; y: number }): string {
  const parts: string[] = []
  const dx = to.x - from.x
  const dy = to.y - from.y
  if (Math.abs(dx) >= 0.005) parts.push(`${m(Math.abs(dx))} ${dx > 0 ? 'further from' : 'closer to'} the front wall (to ${m(to.x)})`)
  if (Math.abs(dy) >= 0.005) parts.push(`${m(Math.abs(dy))} towards the ${dy > 0 ? 'right' : 'left'} wall (to ${m(to.y)} from the left wall)`)
  return parts.length ? parts.join(' and ') : 'to the same spot (no change)'
}

/**
 * What one change does, in plain words: where it goes, what it changes at the main seat (bass
 * spread, early reflections, reverberation) and the setup flags it clears or raises.
 */
export function changeSummary(room: PlanRoom, body: PlanBody, c: ChangePrediction, ctx: { rule: RtRule }): string {
  const out: string[] = []
  const { base, alone } = c
  if (c.id === 'seat' && body.seat) {
    out.push(`Move the main seat ${moveWords(room.seats[0], body.seat)}.`)
  } else if (c.id === 'speakers') {
    const moves = body.speakers.map((s) => {
      const from = room.speakers.find((x) => x.label === s.label)
      return from ? `${s.label} ${moveWords(from, s)}` : s.label
    })
    out.push(`Move speaker ${moves.join('; ')}.`)
  } else if (c.id === 'subwoofers') {
    const moves = body.subwoofers.map((s) => {
      const from = (room.subwoofers ?? []).find((x) => x.label === s.label)
      return from ? `${s.label} ${moveWords(from, s)}` : s.label
    })
    out.push(`Move subwoofer ${moves.join('; ')}.`)
  } else {
    const t = body.treatments.find((x) => x.id === c.id)
    if (t) {
      const size = `${m(t.width)} × ${m(t.height)}${t.thickness > 0 ? `, ${mm(t.thickness)}${t.type === 'diffuser' ? ' deep' : ' thick'}` : ''}${t.airGap ? ` over a ${mm(t.airGap)} air gap` : ''}`
      out.push(`${capitalise(treatmentTypeNames[t.type] ?? t.type)} (${size}) on the ${placement(room, t).text}.`)
      for (const r of c.covers) {
        out.push(`It catches the ${surfaceWords[r.surface]} reflection of speaker ${r.speaker}: ${r.beforeDb.toFixed(1)} dB → ${r.afterDb.toFixed(1)} dB${r.inWindowBefore && !r.inWindowAfter ? ', out of the early-reflection window' : r.inWindowAfter ? ', still inside the window' : ''}.`)
      }
      if (c.absorption && c.absorption.kind !== 'none') {
        const a500 = c.absorption.alpha[3]
        const a125 = c.absorption.alpha[1]
        out.push(`Absorption coefficient ${a125 === null ? '–' : a125.toFixed(2)} at 125 Hz and ${a500 === null ? '–' : a500.toFixed(2)} at 500 Hz (${c.absorption.source}).`)
      }
    }
  }
  if (Math.abs(alone.spreadDb - base.spreadDb) >= 0.3) out.push(`Bass at the seat: peak-to-dip spread ${base.spreadDb.toFixed(1)} dB → ${alone.spreadDb.toFixed(1)} dB.`)
  if (alone.firstInWindow !== base.firstInWindow) out.push(`Strong early reflections at the seat: ${base.firstInWindow} → ${alone.firstInWindow}.`)
  if (Math.abs(alone.rtMidS - base.rtMidS) >= 0.005) out.push(`Reverberation time at 500 Hz–1 kHz: ${base.rtMidS.toFixed(2)} s → ${alone.rtMidS.toFixed(2)} s (target ${ctx.rule === 'bs1116' ? 'ITU-R BS.1116' : 'about 0.3 s for a domestic room'}).`)
  if (c.clearedFlags.length) out.push(`It clears: ${flagList(c.clearedFlags)}.`)
  if (c.raisedFlags.length) out.push(`Watch out, it brings up: ${flagList(c.raisedFlags)}.`)
  if (out.length === 1) out.push('The engine predicts little change at the main seat from this alone.')
  return out.join(' ')
}
