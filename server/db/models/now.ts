import { fn, literal } from 'sequelize'

/**
 * The database's clock (`now()`, the transaction's start) as a default or an update value, so that
 * times written by models compare exactly with times written in the same transaction elsewhere.
 */
export const dbNow = () => fn('now')

/**
 * The database's clock moved by `seconds` (negative: earlier), as a value to write or to compare a
 * column with: every node then reads one clock, whatever its own says (several nodes behind a load
 * balancer need not agree to the second).
 */
export function dbNowPlus(seconds: number) {
  if (!Number.isFinite(seconds)) throw new RangeError(`dbNowPlus: seconds must be a finite number, got ${seconds}`)
  return literal(`(now() + make_interval(secs => ${Number(seconds)}))`)
}

/** A SELECT attribute: whether the model's `column` lies at or before the database's clock (e.g. an expiry). */
export const dbPassed = (model: string, column: string) => literal(`("${model}"."${column}" <= now())`)
