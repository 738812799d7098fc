import { readdirSync, readFileSync, statSync } from 'node:fs'
import { join, relative, resolve } from 'node:path'
import { describe, expect, it } from 'vitest'
import { SETUP_FLAG_IDS } from '../../../shared/acoustics/setup-flags'
import { caseStatuses } from '../../../shared/schemas/case'
import {
  accountStory, beforeAfterHint, caseAnswerWords, caseStatusLabels, checksBreakdown, checksLabel, checksToFix, flagLabel, flagLabels, flagTitle,
  formatAgo, formatDate, formatDateTime, listenerNextStep, measurementHint, openStatuses, severityLabels, statusEmailWords,
} from '../../../shared/words'

const root = resolve(__dirname, '../../..')
const wordsDir = join(root, 'shared/words')

/** Every .vue/.ts/.html/.txt file under src/, templates/, server/ and shared/ except shared/words itself. */
function sources(): { path: string; text: string }[] {
  const out: { path: string; text: string }[] = []
  const walk = (dir: string) => {
    for (const name of readdirSync(dir)) {
      const p = join(dir, name)
      if (statSync(p).isDirectory()) {
        if (p !== wordsDir && name !== 'node_modules') walk(p)
      } else if (/\.(vue|ts|html|txt)$/.test(name)) out.push({ path: relative(root, p), text: readFileSync(p, 'utf8') })
    }
  }
  for (const d of ['src', 'templates', 'server', 'shared']) walk(join(root, d))
  return out
}
const files = sources()

/** Where `phrase` stands as a whole label: a string literal, a text node, or a template line of its own. */
function literalUses(phrase: string): string[] {
  const esc = phrase.replace(/[.*+?^${}()|[\]\\]/g, '\\$&')
  const re = new RegExp(`(['"\`>])\\s*${esc}\\s*(['"\`<])`)
  return files.filter((f) => re.test(f.text)).map((f) => f.path)
}

describe('one label for each case status', () => {
  it('every status of the lifecycle has exactly one label, and no two statuses share one', () => {
    expect(Object.keys(caseStatusLabels).sort()).toEqual([...caseStatuses].sort())
    const labels = Object.values(caseStatusLabels)
    expect(new Set(labels).size).toBe(labels.length)
    // README and shared/case-workflow.ts: draft → submitted shown as "New" → in review ⇄ waiting on listener → plan sent → closed
    expect(caseStatusLabels).toEqual({
      draft: 'Draft', submitted: 'New', in_review: 'In review', waiting_on_listener: 'Waiting on listener', plan_sent: 'Plan sent', closed: 'Closed',
    })
    expect(openStatuses).toEqual(['submitted', 'in_review', 'waiting_on_listener', 'plan_sent'])
    expect(Object.keys(listenerNextStep).sort()).toEqual([...caseStatuses].sort())
  })

  it('no page, component, template or server file spells a status label itself: they all read shared/words/statuses.ts', () => {
    for (const label of Object.values(caseStatusLabels)) {
      // "New" and "Draft" are everyday words ("New: …" in the plan comparison, "Save as draft"); the distinctive labels are checked
      if (label === 'New' || label === 'Draft') continue
      expect(literalUses(label), `"${label}" written outside shared/words`).toEqual([])
    }
  })

  it('the status e-mails name the status with the same label the pages show', () => {
    for (const w of Object.values(statusEmailWords)) expect(caseStatusLabels[w.status]).toBeTruthy()
    const txt = readFileSync(join(root, 'templates/status-changed.txt'), 'utf8')
    const html = readFileSync(join(root, 'templates/status-changed.html'), 'utf8')
    expect(txt).toContain('{{statusLabel}}')
    expect(html).toContain('{{statusLabel}}')
  })
})

describe('one label for each setup flag', () => {
  it('every flag id the engine can raise has exactly one label, none left over, none shared', () => {
    expect(Object.keys(flagLabels).sort()).toEqual([...SETUP_FLAG_IDS].sort())
    const labels = Object.values(flagLabels)
    expect(new Set(labels).size).toBe(labels.length)
    for (const id of SETUP_FLAG_IDS) expect(flagLabel(id)).toBe(flagLabels[id])
    // an id an older engine stored still reads as words, never as a raw id
    expect(flagLabel('wall-rattle-at-40hz')).toBe('Wall rattle at 40hz')
  })

  it('no file outside shared/words writes a flag label, or turns a flag id into words by itself', () => {
    for (const label of Object.values(flagLabels)) expect(literalUses(label), `"${label}" written outside shared/words`).toEqual([])
    const idToWords = files.filter((f) => /\b(?:flag|f)\.id\.replace\(/.test(f.text) || /\bid\.replace\(\/-\/g, ' '\)/.test(f.text)).map((f) => f.path)
    expect(idToWords).toEqual([])
  })

  it('severity reads the same everywhere (one set of words) and a flag title joins severity and name', () => {
    for (const old of ['Worth fixing', 'Good to know']) expect(literalUses(old), old).toEqual([])
    for (const label of Object.values(severityLabels)) expect(literalUses(label).filter((p) => !p.endsWith('.txt')), label).toEqual([])
    expect(flagTitle({ id: 'seat-near-wall', severity: 'warning' })).toBe('Worth a look: Seat close to a wall')
  })
})

describe('one count of the checks', () => {
  const flags = [
    { severity: 'problem' }, { severity: 'problem' }, { severity: 'warning' }, { severity: 'warning' }, { severity: 'warning' },
    { severity: 'info' }, { severity: 'info' },
  ]
  it('counts problems and things worth a look, not notes, and the label says that number', () => {
    expect(checksToFix(flags)).toBe(5)
    expect(checksLabel(flags)).toBe('Checks (5)')
    expect(checksBreakdown(flags)).toBe('5 to fix, 2 notes')
    expect(checksBreakdown(flags.slice(0, 5))).toBe('5 to fix')
  })
  it('the composer and the analysis tab both take their number from checksToFix / checksLabel', () => {
    const composer = files.find((f) => f.path === 'src/components/case/CaseThreadComposer.vue')!.text
    const panel = files.find((f) => f.path === 'src/components/analysis/AnalysisPanel.vue')!.text
    expect(composer).toMatch(/checksLabel\(/)
    expect(composer).not.toMatch(/Checks \(\{\{/)
    expect(panel).toMatch(/checksToFix\(/)
  })
})

describe('who a page speaks to', () => {
  it("the listener's own words are in the second person; staff words speak of the listener", () => {
    for (const text of [...Object.values(caseAnswerWords.listener), ...Object.values(listenerNextStep)]) {
      expect(text, text).not.toMatch(/\b(they|them|their)\b/i)
    }
    expect(caseAnswerWords.listener.description).toBe('What you hear and want')
    expect(caseAnswerWords.staff.description).toBe('What they hear and want')
  })
  it('staff account pages carry no listener marketing', () => {
    const staff = [accountStory.staff.headline, accountStory.staff.lead, ...accountStory.staff.points].join(' ')
    expect(staff).not.toMatch(/\byour (room|chair)\b/i)
    expect(accountStory.staff.headline).not.toBe(accountStory.listener.headline)
  })
  it('the before-and-after hint moves on once measurements are added and analysed', () => {
    const hints = [beforeAfterHint(0, 0), beforeAfterHint(2, 0), beforeAfterHint(2, 1), beforeAfterHint(3, 3)]
    expect(new Set(hints).size).toBe(4)
    expect(hints[0]).toMatch(/Add a measurement/)
    expect(hints[1]).toContain('2 measurements added')
    expect(hints[2]).toMatch(/^One measurement analysed/)
  })
})

describe("the listener's measurement hint", () => {
  const wav = (name: string, channels?: string[]) => ({ name, status: channels ? ('done' as const) : ('queued' as const), kind: channels ? ('impulse-response' as const) : undefined, channels })
  it('invites first, then says what was received and what is still worth sending (the measuring guide: each speaker alone, as WAV)', () => {
    expect(measurementHint([])).toMatchObject({ state: 'none', received: null })
    const fr = measurementHint([{ name: 'seat.txt', status: 'done', kind: 'frequency-response' }])
    expect(fr).toMatchObject({ state: 'partial', received: 'Received: 1 measurement (1 analysed).' })
    expect(fr.next).toMatch(/impulse response as WAV/)
    expect(measurementHint([wav('seat.wav')]).state).toBe('waiting')
    expect(measurementHint([wav('seat_left.wav', ['mono'])]).next).toMatch(/the right speaker alone/)
    expect(measurementHint([wav('seat.wav', ['mono'])]).next).toMatch(/each speaker alone, left and then right/)
    expect(measurementHint([wav('seat-left.wav', ['mono']), wav('seat-right.wav', ['mono'])]).state).toBe('enough')
    expect(measurementHint([wav('seat.wav', ['left', 'right'])]).state).toBe('enough')
    const failed = measurementHint([{ name: 'x.wav', status: 'failed' }])
    expect(failed).toMatchObject({ state: 'unreadable', received: 'Received: 1 measurement (1 could not be read).' })
  })
  it('speaks to the listener in the second person', () => {
    const all = [
      measurementHint([]), measurementHint([wav('a.wav')]), measurementHint([wav('a.wav', ['mono'])]), measurementHint([wav('a_left.wav', ['mono'])]),
      measurementHint([wav('a.wav', ['left', 'right'])]), measurementHint([{ name: 'a.txt', status: 'done', kind: 'frequency-response' }]), measurementHint([{ name: 'a.wav', status: 'failed' }]),
    ]
    for (const h of all) expect(`${h.received ?? ''} ${h.next}`).not.toMatch(/\b(they|them|their|the listener)\b/i)
  })
})

describe('dates: one format, in the viewer\'s zone', () => {
  const at = '2026-12-03T14:05:00Z'
  it('writes day, short month, year and a 24-hour time, in the zone asked for', () => {
    expect(formatDate(at, { timeZone: 'UTC' })).toBe('3 Dec 2026')
    expect(formatDateTime(at, { timeZone: 'UTC' })).toBe('3 Dec 2026, 14:05')
    // IANA tz database: Pacific/Auckland keeps NZDT (UTC+13) in December, so 14:05 UTC is 03:05 the next day
    expect(formatDateTime(at, { timeZone: 'Pacific/Auckland' })).toBe('4 Dec 2026, 03:05')
    // America/New_York keeps EST (UTC−5) in December (IANA tz database)
    expect(formatDateTime(at, { timeZone: 'America/New_York' })).toBe('3 Dec 2026, 09:05')
    expect(formatDateTime(at, { timeZone: 'UTC', withZone: true })).toBe('3 Dec 2026, 14:05 UTC')
    expect(formatDate(null)).toBe('–')
  })
  it('an older moment falls back from "ago" to the same date format', () => {
    const now = Date.parse(at)
    expect(formatAgo(new Date(now - 30 * 60_000).toISOString(), now)).toBe('30 min ago')
    expect(formatAgo('2026-10-01T12:00:00Z', now, { timeZone: 'UTC' })).toBe('1 Oct 2026')
  })
  it('no page or template formats a date by itself: only shared/words/dates.ts does', () => {
    // business-hours.ts reads calendar parts in a desk's zone for arithmetic; metrics.ts checks a zone name is valid
    const allowed = new Set(['server/services/business-hours.ts', 'shared/schemas/metrics.ts'])
    const own = files
      .filter((f) => !allowed.has(f.path))
      .filter((f) => /toLocaleDateString|toLocaleTimeString|toUTCString|\.toLocaleString\(undefined|new Intl\.DateTimeFormat|Intl\.DateTimeFormat\(\)/.test(f.text))
      .map((f) => f.path)
    expect(own).toEqual([])
  })
  it('e-mails state the zone of every time they print', () => {
    const src = files.find((f) => f.path === 'server/mail/templates.ts')!.text
    expect(src).toMatch(/formatDateTime\(d, \{ timeZone: 'UTC', withZone: true \}\)/)
  })
})
