import { boundaryNotches } from './boundaries'
import { materialForOpening } from './materials'
import { analyzeModes, modePressure } from './modes'
import { reflectionPanel } from './reflections'
import type { Opening, Point, RoomBox, Surface, Treatment } from './types'
import { distance, inPlaneAxes, pointCoords, treatmentSize, treatmentSurface } from './types'
import { metresToFeetInches, speedOfSound } from './units'
import { assertOpening, assertPointInRoom, assertRoom } from './validate'

export interface SetupFlag {
  id: string
  severity: 'info' | 'warning' | 'problem'
  /** written for the listener: an advisor can paste it into a reply */
  message: string
}

export interface SetupFlagInput {
  room: RoomBox
  /** the main (stereo) speakers, metres */
  speakers: Point[]
  /** the first seat is the main listening seat, metres */
  seats: Point[]
  openings?: Opening[]
  /** optional: existing treatments (enables the corner-pairing and untreated-reflection checks) */
  treatments?: Treatment[]
  /** optional: subwoofers, metres */
  subwoofers?: Point[]
  /** optional: speaker kinds, parallel to `speakers` (e.g. 'ported-rear') */
  speakerKinds?: (string | undefined)[]
  /** optional: names used in messages, parallel to `speakers` */
  speakerLabels?: string[]
  celsius?: number
  /** the listener's units for lengths in the messages (default 'metric'; 'imperial': feet and inches) */
  units?: 'metric' | 'imperial'
}

/**
 * A message's lengths in the listener's units: with 'imperial' every "N m" / "N.NN m" (not m², m³, ms)
 * becomes feet and inches to the nearest half inch.
 */
export function lengthsInUnits(message: string, units: 'metric' | 'imperial' = 'metric'): string {
  if (units !== 'imperial') return message
  return message.replace(/(\d+(?:\.\d+)?) m(?![²³a-zA-Z])/g, (_, v: string) => {
    const { feet, inches } = metresToFeetInches(parseFloat(v), 0.5)
    return feet === 0 ? `${inches} in` : inches === 0 ? `${feet} ft` : `${feet} ft ${inches} in`
  })
}

/** Every flag id this module can raise, in a stable order. */
export const SETUP_FLAG_IDS = [
  'seat-in-front-of-speakers',
  'seat-at-room-centre',
  'near-square-plan',
  'dimension-multiples',
  'coincident-low-modes',
  'speakers-asymmetric',
  'seat-off-centreline',
  'seat-near-wall',
  'speaker-spacing-vs-listening-distance',
  'speaker-too-close-to-boundary',
  'rear-port-near-wall',
  'opening-in-reflection-zone',
  'opening-asymmetry',
  'one-sided-corner-treatment',
  'untreated-first-reflections',
  'seat-at-mode-null',
  'speaker-height-vs-ear',
  'facing-long-wall',
] as const

const m2 = (v: number) => `${v.toFixed(2)} m`
const hz = (v: number) => `${Math.round(v)} Hz`
const cap = (t: string) => t.charAt(0).toUpperCase() + t.slice(1)
/** An opening kind as words ('open-doorway' → 'open doorway') and with its article ('an alcove'). */
const openingWords = (kind: string) => kind.replace(/-/g, ' ')
const withArticle = (words: string) => `${/^[aeiou]/i.test(words) ? 'an' : 'a'} ${words}`
const SEVERITY_RANK = { problem: 0, warning: 1, info: 2 } as const

/** Thresholds (common practice, no source unless named). */
export const FLAG_THRESHOLDS = {
  /** seat or speakers off the centre line by more than this, metres */
  symmetryM: 0.1,
  /** seat within ±5 % of the length around the middle */
  roomCentreFraction: 0.05,
  /** plan ratio below this counts as near-square */
  nearSquareRatio: 1.1,
  /** dimensions within ±5 % of an integer multiple (Walker, BBC RD 1993/8, from memory) */
  multipleTolerance: 0.05,
  /** coincident axial modes below this frequency, Hz */
  lowModeHz: 150,
  /** seat closer than this to the wall behind or beside it, metres */
  seatWallM: 0.6,
  /** speaker angle at the seat: ±30° is the ITU-R BS.775 stereo layout (from memory); flagged outside 45°–80° in all */
  minAngleDeg: 45,
  maxAngleDeg: 80,
  /** a single boundary notch in this range is worth a note, Hz */
  notchRangeHz: [80, 300] as [number, number],
  /** two notches within this many octaves stack into one deep dip */
  stackOctaves: 1 / 3,
  /** corner treatment counts as being in a corner within this distance of both walls, metres */
  cornerM: 0.6,
  /** speaker acoustic centre more than this above or below the ear, metres */
  earHeightM: 0.25,
}

function speakerNames(input: SetupFlagInput): string[] {
  if (input.speakerLabels && input.speakerLabels.length === input.speakers.length) return input.speakerLabels.map((l) => `speaker “${l}”`)
  if (input.speakers.length === 2) {
    const leftFirst = input.speakers[0].y <= input.speakers[1].y
    return leftFirst ? ['the left speaker', 'the right speaker'] : ['the right speaker', 'the left speaker']
  }
  return input.speakers.map((_, i) => `speaker ${i + 1}`)
}

function overlaps(a0: number, a1: number, b0: number, b1: number): boolean {
  return Math.min(a1, b1) - Math.max(a0, b0) > 0
}

/**
 * Setup problems an advisor would point out, each with a severity and a message for the listener.
 * The first seat is taken as the main seat.
 */
export function setupFlags(input: SetupFlagInput): SetupFlag[] {
  const { room } = input
  assertRoom(room)
  if (!Array.isArray(input.speakers) || input.speakers.length === 0) throw new RangeError('setupFlags needs at least one speaker')
  if (!Array.isArray(input.seats) || input.seats.length === 0) throw new RangeError('setupFlags needs at least one seat')
  input.speakers.forEach((p, i) => assertPointInRoom(room, p, `speaker ${i + 1}`))
  input.seats.forEach((p, i) => assertPointInRoom(room, p, `seat ${i + 1}`))
  ;(input.subwoofers ?? []).forEach((p, i) => assertPointInRoom(room, p, `subwoofer ${i + 1}`))
  const openings = input.openings ?? []
  openings.forEach((o, i) => assertOpening(room, o, `opening ${i + 1}`))
  const celsius = input.celsius ?? 20
  const c = speedOfSound(celsius)
  const T = FLAG_THRESHOLDS
  const { length: L, width: W, height: H } = room
  const seat = input.seats[0]
  const speakers = input.speakers
  const names = speakerNames(input)
  const flags: SetupFlag[] = []
  const units = input.units ?? 'metric'
  if (units !== 'metric' && units !== 'imperial') throw new RangeError(`units must be 'metric' or 'imperial': got ${String(units)}`)
  const add = (id: (typeof SETUP_FLAG_IDS)[number], severity: SetupFlag['severity'], message: string) => flags.push({ id, severity, message: lengthsInUnits(message, units) })

  // --- seat and plan ---------------------------------------------------------------------------
  const frontMost = Math.max(...speakers.map((s) => s.x))
  if (seat.x <= frontMost) {
    add('seat-in-front-of-speakers', 'problem',
      `Your main seat (${m2(seat.x)} from the front wall) is not behind the speakers (${m2(frontMost)} from it). Please check the positions you entered; the speakers should stand between the front wall and you.`)
  }
  if (Math.abs(seat.x - L / 2) <= T.roomCentreFraction * L) {
    add('seat-at-room-centre', 'warning',
      `Your seat is close to the middle of the room from front to back (${m2(seat.x)} of ${m2(L)}). That is where the room's lowest front-to-back resonance cancels, so bass tends to sound thin there. About 38 % of the length from the front or back wall (${m2(0.38 * L)} or ${m2(0.62 * L)} from the front) is a usual better starting point.`)
  }
  const plan = Math.max(L, W) / Math.min(L, W)
  if (plan < T.nearSquareRatio) {
    add('near-square-plan', plan < 1.03 ? 'problem' : 'warning',
      `Your room is almost square (${m2(L)} by ${m2(W)}). Its front-to-back and side-to-side resonances fall at nearly the same frequencies and reinforce each other, which makes some bass notes boom. Placement matters more than usual here, and bass traps will help.`)
  }
  const dims: [string, number][] = [['length', L], ['width', W], ['height', H]]
  const multiples: string[] = []
  for (let i = 0; i < 3; i++) for (let j = i + 1; j < 3; j++) {
    const [na, a] = dims[i]
    const [nb, b] = dims[j]
    const r = Math.max(a, b) / Math.min(a, b)
    const n = Math.round(r)
    const isPlan = i === 0 && j === 1
    if (n >= (isPlan ? 2 : 1) && Math.abs(r - n) <= T.multipleTolerance * n) {
      multiples.push(n === 1 ? `the ${na} and ${nb} are about equal` : `the ${a > b ? na : nb} is about ${n} times the ${a > b ? nb : na}`)
    }
  }
  if (multiples.length) {
    add('dimension-multiples', 'warning',
      `In your room ${multiples.join(' and ')}. When dimensions are equal or simple multiples, their resonances land on the same frequencies and stack up, so a few bass notes ring much louder than the rest.`)
  }
  const analysis = analyzeModes(room, { celsius, analysisMaxHz: T.lowModeHz })
  const stacked = analysis.coincidences.filter((g) => g.axialCount >= 2)
  if (stacked.length) {
    const list = stacked.map((g) => hz(g.hz)).join(', ')
    add('coincident-low-modes', 'warning',
      `Two or more of your room's main resonances fall at practically the same frequency (${list}). Notes near ${stacked.length > 1 ? 'those frequencies' : 'that frequency'} will boom and hang on. Bass traps in the corners and careful seat placement are the usual remedies.`)
  }

  // --- symmetry ----------------------------------------------------------------------------------
  if (speakers.length >= 2) {
    const byY = speakers.map((p, i) => ({ p, name: names[i] })).sort((a, b) => a.p.y - b.p.y)
    const left = byY[0]
    const right = byY[byY.length - 1]
    const reasons: string[] = []
    let worst = 0
    const sideDiff = Math.abs(left.p.y - (W - right.p.y))
    if (sideDiff > T.symmetryM) {
      reasons.push(`${left.name} is ${m2(left.p.y)} from its side wall and ${right.name} ${m2(W - right.p.y)} from its side wall`)
      worst = Math.max(worst, sideDiff)
    }
    const frontDiff = Math.abs(left.p.x - right.p.x)
    if (frontDiff > T.symmetryM) {
      reasons.push(`they stand ${m2(left.p.x)} and ${m2(right.p.x)} from the front wall`)
      worst = Math.max(worst, frontDiff)
    }
    const dl = distance(left.p, seat)
    const dr = distance(right.p, seat)
    if (Math.abs(dl - dr) > T.symmetryM) {
      reasons.push(`they are ${m2(dl)} and ${m2(dr)} from your seat`)
      worst = Math.max(worst, Math.abs(dl - dr))
    }
    if (reasons.length) {
      add('speakers-asymmetric', worst > 0.3 ? 'problem' : 'warning',
        `Your speakers are not placed symmetrically: ${reasons.join('; ')}. Each speaker then meets the room differently, which blurs the stereo image and makes the bass differ between channels. Mirror their positions about the room's centre line as closely as you can.`)
    }
  }
  const offCentre = seat.y - W / 2
  if (Math.abs(offCentre) > T.symmetryM) {
    add('seat-off-centreline', Math.abs(offCentre) > 0.3 ? 'problem' : 'warning',
      `Your main seat is ${m2(Math.abs(offCentre))} ${offCentre < 0 ? 'left' : 'right'} of the room's centre line. Sitting off-centre puts you closer to one speaker and one side wall, so the image pulls to one side and the side-to-side resonances are no longer cancelled at your seat. Moving the seat onto the centre line usually helps more than any treatment.`)
  }
  const backGap = L - seat.x
  const sideGap = Math.min(seat.y, W - seat.y)
  if (backGap < T.seatWallM || sideGap < T.seatWallM) {
    const near = backGap <= sideGap ? `the wall behind you (${m2(backGap)})` : `a side wall (${m2(sideGap)})`
    add('seat-near-wall', Math.min(backGap, sideGap) < 0.3 ? 'problem' : 'warning',
      `Your seat is close to ${near}. Bass builds up strongly next to a wall and its reflection arrives almost together with the direct sound, which colours the tone. If you can, move the seat forward so there is at least ${m2(T.seatWallM)}${backGap <= sideGap ? ', or treat the wall behind you with thick absorption' : ''}.`)
  }
  if (speakers.length >= 2) {
    const byY = [...speakers].sort((a, b) => a.y - b.y)
    const a = byY[0]
    const b = byY[byY.length - 1]
    const va = [a.x - seat.x, a.y - seat.y]
    const vb = [b.x - seat.x, b.y - seat.y]
    const cos = (va[0] * vb[0] + va[1] * vb[1]) / (Math.hypot(va[0], va[1]) * Math.hypot(vb[0], vb[1]))
    const angle = (Math.acos(Math.max(-1, Math.min(1, cos))) * 180) / Math.PI
    const spacing = Math.hypot(a.x - b.x, a.y - b.y)
    const listen = (Math.hypot(va[0], va[1]) + Math.hypot(vb[0], vb[1])) / 2
    if (angle < T.minAngleDeg || angle > T.maxAngleDeg) {
      add('speaker-spacing-vs-listening-distance', 'warning',
        `Your speakers are ${m2(spacing)} apart and about ${m2(listen)} from you, so they span ${Math.round(angle)}° at your seat. A span near 60° (an equilateral triangle: spacing equal to the distance to each speaker) gives the most natural stereo image; ${angle < T.minAngleDeg ? 'move them further apart or sit closer' : 'move them closer together or sit further back'}.`)
    }
  }

  // --- boundaries ----------------------------------------------------------------------------------
  const notchNotes: string[] = []
  let notchSeverity: SetupFlag['severity'] = 'info'
  speakers.forEach((p, i) => {
    const notches = boundaryNotches(room, p, { celsius }).filter((n) => ['front', 'left', 'right', 'floor'].includes(n.surface))
    const side = p.y <= W / 2 ? 'left' : 'right'
    const relevant = notches.filter((n) => n.surface === 'front' || n.surface === side || n.surface === 'floor')
    const inRange = relevant.filter((n) => n.notchHz >= T.notchRangeHz[0] && n.notchHz <= T.notchRangeHz[1])
    const pairs: string[] = []
    for (let a = 0; a < inRange.length; a++) for (let b = a + 1; b < inRange.length; b++) {
      if (Math.abs(Math.log2(inRange[a].notchHz / inRange[b].notchHz)) <= T.stackOctaves) {
        pairs.push(`the ${inRange[a].surface === 'front' ? 'front wall' : inRange[a].surface === 'floor' ? 'floor' : 'side wall'} (${m2(inRange[a].distance)}) and the ${inRange[b].surface === 'front' ? 'front wall' : inRange[b].surface === 'floor' ? 'floor' : 'side wall'} (${m2(inRange[b].distance)})`)
      }
    }
    if (pairs.length) {
      notchSeverity = 'warning'
      notchNotes.push(`${names[i]} is about as far from ${pairs[0]}, so their cancellations pile up near ${hz(inRange[0].notchHz)}`)
    } else {
      const front = inRange.find((n) => n.surface === 'front')
      if (front) notchNotes.push(`${names[i]} is ${m2(front.distance)} from the front wall, which cancels some sound near ${hz(front.notchHz)}`)
    }
  })
  if (notchNotes.length) {
    add('speaker-too-close-to-boundary', notchSeverity,
      `Sound bouncing off nearby walls partly cancels the direct sound from a speaker at one frequency: ${notchNotes.join('; ')}. Moving a speaker much closer to the wall (under about ${m2(c / (4 * T.notchRangeHz[1]))}) pushes the dip above the bass, moving it further out lowers it, and different distances to each wall keep the dips from stacking. Absorption behind the speakers also softens it.`)
  }
  const kinds = input.speakerKinds ?? []
  const portNear = speakers.map((p, i) => ({ p, i })).filter(({ p, i }) => kinds[i] === 'ported-rear' && p.x < 0.2)
  if (portNear.length) {
    add('rear-port-near-wall', 'warning',
      `${cap(portNear.map(({ i }) => names[i]).join(' and '))} ${portNear.length > 1 ? 'have ports' : 'has a port'} on the back and ${portNear.length > 1 ? 'stand' : 'stands'} less than 0.2 m from the wall. That chokes the port and makes the bass boomy; give ${portNear.length > 1 ? 'them' : 'it'} a little more room or use the port plugs if the maker supplies them.`)
  }

  // --- openings ------------------------------------------------------------------------------------
  const walls: Surface[] = ['front', 'back', 'left', 'right']
  // each opening (kind on a wall) is named once, with the speakers whose reflection it takes
  const hit = new Map<string, number[]>()
  for (const [i, p] of speakers.entries()) {
    if (distance(p, seat) === 0) continue
    for (const wall of walls) {
      const panel = reflectionPanel(room, p, seat, wall, { marginM: 0 })
      const [ua] = inPlaneAxes(wall)
      const lo = pointCoords(panel.min)
      const hi = pointCoords(panel.max)
      for (const o of openings) {
        if (o.wall !== wall) continue
        if (overlaps(o.from, o.to, lo[ua], hi[ua]) && overlaps(o.bottom, o.top, lo[2], hi[2])) {
          const where = `the ${openingWords(o.kind)} on the ${wall} wall`
          const from = hit.get(where) ?? []
          if (!from.includes(i)) from.push(i)
          hit.set(where, from)
        }
      }
    }
  }
  if (hit.size) {
    const whose = (from: number[]) => (speakers.length === 2 && from.length === 2 ? 'both speakers' : from.map((i) => names[i]).join(' and '))
    const said = [...hit].map(([where, from]) => `${where} (${whose(from)})`)
    add('opening-in-reflection-zone', 'warning',
      `A first reflection reaches your seat from ${said.join(', ')}. Glass reflects strongly and an open doorway or alcove returns nothing, so the two sides of the stereo image no longer match. A curtain, a panel or moving the seat slightly can even this out.`)
  }
  const frontZone = seat.x + 0.5
  const sideOpenings = (wall: 'left' | 'right') => openings.filter((o) => o.wall === wall && o.from < frontZone && o.to - o.from >= 0.3)
  const lefts = sideOpenings('left')
  const rights = sideOpenings('right')
  const unmatched = [
    ...lefts.filter((o) => !rights.some((r) => overlaps(o.from, o.to, r.from, r.to))),
    ...rights.filter((o) => !lefts.some((l) => overlaps(o.from, o.to, l.from, l.to))),
  ]
  if (unmatched.length) {
    const kinds2 = unmatched.map((o) => `${withArticle(openingWords(o.kind))} on the ${o.wall} wall (${m2(o.from)}–${m2(o.to)} from the front)`)
    add('opening-asymmetry', unmatched.some((o) => materialForOpening(o.kind) === 'open-doorway' || o.kind === 'alcove') ? 'warning' : 'info',
      `Between the speakers and your seat there is ${kinds2.join(' and ')} with nothing matching it on the other side. The two sides of the room then reflect and hold bass differently, which can pull the stereo image sideways. A curtain or panel on the opposite side, or over the opening, restores the balance.`)
  }

  // --- treatments ----------------------------------------------------------------------------------
  const treatments = input.treatments
  if (treatments) {
    const corners = { 'front-left': [0, 0], 'front-right': [0, W], 'back-left': [L, 0], 'back-right': [L, W] } as const
    const isTrap = (t: Treatment) => t.type === 'bass-trap' || t.type === 'corner-trap' || t.mounting === 'corner'
    const cornerHas = (name: keyof typeof corners) => treatments.some((t) => {
      if (!isTrap(t) || t.x === undefined || t.y === undefined) return false
      const [cx, cy] = corners[name]
      return Math.abs(t.x - cx) <= T.cornerM && Math.abs(t.y - cy) <= T.cornerM
    })
    const lonely: string[] = []
    for (const [a, b] of [['front-left', 'front-right'], ['back-left', 'back-right']] as const) {
      const ha = cornerHas(a)
      const hb = cornerHas(b)
      if (ha !== hb) lonely.push(ha ? `${a} corner but not the ${b}` : `${b} corner but not the ${a}`)
    }
    if (lonely.length) {
      add('one-sided-corner-treatment', 'warning',
        `You have a bass trap in the ${lonely.join(', and in the ')}. A trap on one side only makes the bass differ between the speakers; traps work best in symmetric pairs, so add its partner or move it.`)
    }
    const covered = (surface: Surface, p: Point) => treatments.some((t) => {
      if (treatmentSurface(t) !== surface) return false
      const [ua, va] = inPlaneAxes(surface)
      const c3 = [t.x, t.y, t.z]
      const { widthM, heightM } = treatmentSize(t)
      if (c3[ua] === undefined || c3[va] === undefined) return false
      const pc = pointCoords(p)
      return Math.abs(pc[ua] - (c3[ua] as number)) <= widthM / 2 && Math.abs(pc[va] - (c3[va] as number)) <= heightM / 2
    })
    const bare: string[] = []
    speakers.forEach((p, i) => {
      if (distance(p, seat) === 0) return
      for (const wall of ['left', 'right'] as const) {
        const panel = reflectionPanel(room, p, seat, wall, { marginM: 0 })
        if (!covered(wall, panel.centre)) bare.push(`${names[i]} off the ${wall} wall, about ${m2(panel.centre.x)} from the front wall at ${m2(panel.centre.z)} height`)
      }
    })
    if (bare.length) {
      add('untreated-first-reflections', 'info',
        `These side-wall reflections reach you untreated: ${bare.join('; ')}. A 50 mm absorbing panel at each spot (find it with a mirror: where you see the speaker from your seat) usually sharpens the stereo image.`)
    }
  }

  // --- modes at the seat and heights -------------------------------------------------------------
  const nulls: string[] = []
  const checks: [number, number, number][] = [[1, 0, 0], [2, 0, 0], [0, 0, 1]]
  for (const n of checks) {
    if (n[0] === 1 && flags.some((f) => f.id === 'seat-at-room-centre')) continue
    const p = modePressure(room, n, seat)
    if (Math.abs(p) < 0.316) {
      const f = (c / 2) * Math.hypot(n[0] / L, n[1] / W, n[2] / H)
      nulls.push(`${hz(f)} (${n[2] ? 'floor to ceiling' : 'front to back'})`)
    }
  }
  if (nulls.length) {
    add('seat-at-mode-null', 'info',
      `Your seat sits where ${nulls.length > 1 ? 'these room resonances cancel' : 'this room resonance cancels'}: ${nulls.join(', ')}. Those notes may sound weak at your seat however loud you play them; moving the seat a little changes which notes are affected.`)
  }
  const off = speakers.map((p, i) => ({ d: p.z - seat.z, i })).filter((e) => Math.abs(e.d) > T.earHeightM)
  if (off.length) {
    add('speaker-height-vs-ear', 'info',
      `${cap(off.map((e) => names[e.i]).join(' and '))} ${off.length > 1 ? 'are' : 'is'} ${m2(Math.abs(off[0].d))} ${off[0].d > 0 ? 'above' : 'below'} your ear height. Most speakers sound best with the tweeter near ear height or angled towards your ears.`)
  }
  if (W > L * 1.05) {
    add('facing-long-wall', 'info',
      `Your speakers stand on one of the room's long walls (the room is ${m2(L)} deep and ${m2(W)} wide). That keeps the side walls far away, which is good for the stereo image, but your seat is then usually near the wall behind you, where bass piles up; keep some distance from it or treat it.`)
  }

  return flags.sort((a, b) => SEVERITY_RANK[a.severity] - SEVERITY_RANK[b.severity] || SETUP_FLAG_IDS.indexOf(a.id as never) - SETUP_FLAG_IDS.indexOf(b.id as never))
}
