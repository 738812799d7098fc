import './setup-config'
import { describe, expect, it } from 'vitest'
import { config, setConfigForTests } from '../../../server/config'
import { maybeStartFakeSmtp, startFakeSmtp } from '../../../server/mail/fake-smtp'

describe('the fake SMTP server', () => {
  it.each(['0.0.0.0', '::', '192.168.1.20'])('refuses to listen on %s (loopback only)', async (host) => {
    await expect(startFakeSmtp({ port: 0, host })).rejects.toThrow(/loopback only/)
  })
  it('maybeStartFakeSmtp starts nothing when FAKE_SMTP is off', async () => {
    setConfigForTests({ ...config(), FAKE_SMTP: 'off' })
    expect(await maybeStartFakeSmtp()).toBeNull()
  })
  it('listens on a loopback port of its own when asked for port 0, and stops', async () => {
    const fake = await startFakeSmtp({ port: 0, host: '127.0.0.1' })
    try {
      expect(fake.port).toBeGreaterThan(0)
    } finally {
      await fake.stop()
    }
  })
})
