/** The longest original file name Roomwright keeps, in characters (code points). */
export const MAX_FILENAME_LENGTH = 200

const CONTROL = /[\u0000-\u001f\u007f-\u009f\u200e\u200f\u202a-\u202e\u2066-\u2069]/g

/**
 * A client's file name made safe to store and show: the last path part only (either slash),
 * line breaks and tabs turned to blanks, other control and bidirectional-override characters
 * removed, blanks collapsed, no leading dots,
 * at most 200 characters (the extension kept when cutting), `upload` when nothing is left.
 * Storage keys never come from this name.
 */
export function sanitiseFilename(name: string | undefined | null): string {
  let n = String(name ?? '').normalize('NFC')
  n = n.split(/[\\/]/).pop() ?? ''
  n = n.replace(/[\t\n\v\f\r]/g, ' ').replace(CONTROL, '').replace(/\s+/g, ' ').trim().replace(/^[.\s]+/, '')
  if (!n) return 'upload'
  const chars = [...n]
  if (chars.length <= MAX_FILENAME_LENGTH) return n
  const ext = /\.[^.\s]{1,10}$/.exec(n)?.[0] ?? ''
  const extChars = [...ext].length
  return chars.slice(0, MAX_FILENAME_LENGTH - extChars).join('').trimEnd() + ext
}
