import { Sequelize } from 'sequelize'
import { config } from '../config'

let instance: Sequelize | undefined

/** The process's one Sequelize instance, built from DATABASE_URL on first use. */
export function db(): Sequelize {
  instance ??= new Sequelize(config().DATABASE_URL, {
    dialect: 'postgres',
    logging: false,
    pool: { max: 10, min: 0, idle: 10_000, acquire: 5_000 },
    dialectOptions: { connectionTimeoutMillis: 3_000, statement_timeout: config().DB_STATEMENT_TIMEOUT_MS },
    define: { underscored: true },
  })
  return instance
}

export async function closeDb(): Promise<void> {
  if (instance) {
    const s = instance
    instance = undefined
    await s.close()
  }
}
