import { fn } from 'sequelize'

/**
 * The database's clock (`now()`, the transaction's start) as a default or an update value, so that
 * times written by models compare exactly with times written in the same transaction elsewhere.
 */
export const dbNow = () => fn('now')
