import { describe, expect, it } from 'vitest'
import { senderFailsAuthentication } from '../../../server/mail/inbound'

// Authentication-Results values in the syntax of RFC 8601 §2.2 (examples after its Appendix B);
// verdict names from RFC 7208 §2.6 (SPF), RFC 6376 (DKIM), RFC 7489 (DMARC).
describe('senderFailsAuthentication reads the receiving server\'s verdict', () => {
  it.each([
    'mx.example.org; dmarc=fail (p=reject) header.from=example.com',
    'mx.example.org; spf=fail smtp.mailfrom=example.com; dkim=none',
    'mx.example.org; spf=fail smtp.mailfrom=example.com; dkim=fail header.d=example.com',
    'MX.EXAMPLE.ORG; SPF=FAIL smtp.mailfrom=example.com',
  ])('forged: %s', (v) => expect(senderFailsAuthentication(v)).toBe(true))
  it.each([
    undefined, '', 'mx.example.org; none',
    'mx.example.org; spf=pass smtp.mailfrom=example.com; dkim=pass header.d=example.com; dmarc=pass',
    'mx.example.org; spf=fail smtp.mailfrom=example.com; dkim=pass header.d=example.com',
    'mx.example.org; spf=softfail smtp.mailfrom=example.com',
    'mx.example.org; spf=neutral; dmarc=none',
  ])('not forged: %s', (v) => expect(senderFailsAuthentication(v)).toBe(false))
})
