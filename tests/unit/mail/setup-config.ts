import { loadConfig, setConfigForTests } from '../../../server/config'

/** Unit tests run without a database; a placeholder URL satisfies the configuration check. */
export const UNIT_PUBLIC_URL = 'https://desk.roomwright.test'
export const UNIT_REPLY_DOMAIN = 'reply.roomwright.test'
setConfigForTests(
  loadConfig({ DATABASE_URL: 'postgres://unit@127.0.0.1:1/unit', PUBLIC_URL: UNIT_PUBLIC_URL, MAIL_REPLY_DOMAIN: UNIT_REPLY_DOMAIN, NODE_ENV: 'test' }),
)
