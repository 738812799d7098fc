import './setup-config'
import { describe, expect, it } from 'vitest'
import { extractReplyToken, htmlToReplyText, parseAddress, stripQuotedReply } from '../../../server/mail/inbound'

const TOKEN = 'q7VfT2mW9xLc4Rb8Zk1NpA'

describe('stripQuotedReply — realistic replies (client layouts as commonly seen, from memory)', () => {
  // Each reply as a client lays it out (lines, and the line ending it uses) and what the listener wrote.
  const layouts: { client: string; lines: string[]; eol?: string; reply: string }[] = [
    {
      client: 'Gmail: cuts at "On … wrote:" and the quoted lines under it',
      lines: ['Thanks, the sofa is 80 cm from the back wall.', '', 'On Tue, 4 Jun 2024 at 09:12, Roomwright <desk@roomwright.test> wrote:', '', '> Hello Ana,', '> Odile Brenner answered on your case “Boom at 43 Hz”:'],
      reply: 'Thanks, the sofa is 80 cm from the back wall.',
    },
    {
      client: 'Gmail: the "On … wrote:" header wrapped onto two lines',
      lines: ['Yes, both speakers are 1.1 m from the side walls.', '', 'On Tue, 4 Jun 2024 at 09:12, Roomwright <', `reply+${TOKEN}@reply.roomwright.test> wrote:`, '> quoted'],
      reply: 'Yes, both speakers are 1.1 m from the side walls.',
    },
    {
      client: 'Apple Mail on a phone: drops the "Sent from my iPhone" footer and the quote',
      lines: ['The ceiling is 2.4 m high.', '', 'Sent from my iPhone', '', '> On 4 Jun 2024, at 09:12, Roomwright <desk@roomwright.test> wrote:', '> Hello'],
      reply: 'The ceiling is 2.4 m high.',
    },
    {
      client: 'Outlook desktop: cuts at the rule and From:/Sent: block, even without ">" quoting',
      lines: ['Here are the photos you asked for.', '', 'Best,', 'Ana', '', '________________________________', 'From: Roomwright <desk@roomwright.test>', 'Sent: Tuesday, June 4, 2024 9:12 AM', 'To: Ana Ruiz <ana@example.test>', 'Subject: A question about “Boom at 43 Hz”', '', 'Hello Ana,'],
      eol: '\r\n',
      reply: 'Here are the photos you asked for.\n\nBest,\nAna',
    },
    {
      client: 'Outlook: a From:/Sent: block without the rule',
      lines: ['Measured again tonight.', '', 'From: Roomwright <desk@roomwright.test>', 'Sent: 04 June 2024 09:12', 'Subject: x'],
      reply: 'Measured again tonight.',
    },
  ]
  it.each(layouts)('$client', ({ lines, eol, reply }) => {
    expect(stripQuotedReply(lines.join(eol ?? '\n'))).toBe(reply)
  })
  it('older Outlook: "-----Original Message-----"', () => {
    expect(stripQuotedReply('Done.\n\n-----Original Message-----\nFrom: Roomwright\nHello')).toBe('Done.')
  })
  it('an answer written between quoted lines keeps every answer and drops the quotes', () => {
    const mail = ['> Where is the seat?', 'At 3.8 m from the front wall.', '> And the subwoofer?', 'Front left corner.', ''].join('\n')
    expect(stripQuotedReply(mail)).toBe('At 3.8 m from the front wall.\nFront left corner.')
  })
  it('cuts at the signature separator "-- " (RFC 3676 §4.3)', () => {
    expect(stripQuotedReply('The door is on the left wall.\n\n-- \nAna Ruiz\n+44 20 7946 0000')).toBe('The door is on the left wall.')
  })
  it('cuts at our own marker when a client quotes without ">"', () => {
    const mail = ['File attached: left speaker only.', '', '— Write your answer above this line to add it to the case —', '', 'ROOMWRIGHT · advice for listening rooms', 'Hello Ana,'].join('\n')
    expect(stripQuotedReply(mail)).toBe('File attached: left speaker only.')
  })
  it('French, German and forwarded-message headers', () => {
    expect(stripQuotedReply('Merci !\n\nLe mar. 4 juin 2024 à 09:12, Roomwright <desk@roomwright.test> a écrit :\n> Bonjour')).toBe('Merci !')
    expect(stripQuotedReply('Danke.\n\nAm Di., 4. Juni 2024 um 09:12 Uhr schrieb Roomwright <desk@roomwright.test>:\n> Hallo')).toBe('Danke.')
    expect(stripQuotedReply('See below.\n\n---------- Forwarded message ---------\nFrom: x')).toBe('See below.')
  })
  it('keeps the listener\'s own lines that merely start with "On" or "From"', () => {
    const mail = 'On the left wall there is a window, 1.2 m wide.\nFrom the seat I see the door.\nOn Sunday I wrote: the bass got better.'
    expect(stripQuotedReply(mail)).toBe(mail)
  })
  it('nothing but quoted history leaves nothing', () => {
    expect(stripQuotedReply('\n\n> quoted only\n> more\n')).toBe('')
  })
})

describe('htmlToReplyText', () => {
  it('a Gmail HTML reply: keeps the new lines, drops the gmail_quote block', () => {
    const html = '<div dir="ltr">Thanks!<br>The rug is 2 × 3 m.</div><br><div class="gmail_quote"><div class="gmail_attr">On Tue, 4 Jun 2024 at 09:12 Roomwright wrote:<br></div><blockquote class="gmail_quote">Hello Ana</blockquote></div>'
    expect(stripQuotedReply(htmlToReplyText(html))).toBe('Thanks!\nThe rug is 2 × 3 m.')
  })
})

describe('extractReplyToken and parseAddress', () => {
  it('finds the token in a bare, a named or a listed recipient, keeping its letter case', () => {
    expect(extractReplyToken(`reply+${TOKEN}@reply.roomwright.test`)).toBe(TOKEN)
    expect(extractReplyToken(`"Desk, Roomwright" <reply+${TOKEN}@REPLY.roomwright.test>, other@example.test`)).toBe(TOKEN)
    expect(extractReplyToken(['ana@example.test', `Roomwright <reply+${TOKEN}@reply.roomwright.test>`])).toBe(TOKEN)
  })
  it('ignores other domains, look-alike domains, malformed and short tokens', () => {
    expect(extractReplyToken(`reply+${TOKEN}@reply.roomwright.test.evil.example`)).toBeNull()
    expect(extractReplyToken(`reply+${TOKEN}@evil.example`)).toBeNull()
    expect(extractReplyToken('reply+short@reply.roomwright.test')).toBeNull()
    expect(extractReplyToken(`reply+${TOKEN}'--@reply.roomwright.test`)).toBeNull()
    expect(extractReplyToken(`desk@reply.roomwright.test`)).toBeNull()
  })
  it('parseAddress lower-cases the bare address of a named sender', () => {
    expect(parseAddress('Ana Ruiz <Ana.Ruiz@Example.TEST>')).toBe('ana.ruiz@example.test')
    expect(parseAddress('ana@example.test')).toBe('ana@example.test')
    expect(parseAddress('no address here')).toBeNull()
  })
})
