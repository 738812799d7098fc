import { describe, expect, it } from 'vitest'
import { MAX_FILENAME_LENGTH, sanitiseFilename } from '../../../server/uploads'

describe('sanitiseFilename', () => {
  it.each([
    ['../../etc/passwd', 'passwd'],
    ['/etc/shadow', 'shadow'],
    ['C:\\Users\\me\\Pictures\\listening room.jpg', 'listening room.jpg'],
    ['..\\..\\boot.ini', 'boot.ini'],
    ['..', 'upload'],
    ['.htaccess', 'htaccess'],
    ['', 'upload'],
    ['   ', 'upload'],
    ['left\u0000speaker.wav', 'leftspeaker.wav'],
    ['bell\u0007\r\n.png', 'bell .png'],
    ['bell\u0007.png', 'bell.png'],
    ['photo\u202egpj.exe', 'photogpj.exe'],
    ['tab\tand   spaces .txt', 'tab and spaces .txt'],
    ['Wohnzimmer – Ecke.jpg', 'Wohnzimmer – Ecke.jpg'],
  ])('%j → %j', (input, expected) => {
    expect(sanitiseFilename(input)).toBe(expected)
  })

  it('undefined and null become "upload"', () => {
    expect(sanitiseFilename(undefined)).toBe('upload')
    expect(sanitiseFilename(null)).toBe('upload')
  })

  it(`cuts long names to ${MAX_FILENAME_LENGTH} characters and keeps the extension`, () => {
    const out = sanitiseFilename('r'.repeat(300) + '.jpeg')
    expect([...out].length).toBe(MAX_FILENAME_LENGTH)
    expect(out.endsWith('.jpeg')).toBe(true)
  })

  it('counts characters, not UTF-16 units or bytes, and never splits an emoji', () => {
    const out = sanitiseFilename('🎧'.repeat(250))
    expect([...out].length).toBe(MAX_FILENAME_LENGTH)
    expect(out).toBe('🎧'.repeat(MAX_FILENAME_LENGTH))
  })

  it('is idempotent', () => {
    for (const n of ['../a/b\u0007c.wav', 'x'.repeat(500) + '.png', ' .hidden ', 'ok.txt']) {
      expect(sanitiseFilename(sanitiseFilename(n))).toBe(sanitiseFilename(n))
    }
  })
})
