import { migrateUp, migrateDown } from './migrate'
import { closeDb } from './sequelize'

const [cmd = 'up', to] = process.argv.slice(2)
if (cmd === 'down') await migrateDown(to)
else console.log('applied:', (await migrateUp()).join(', ') || 'nothing pending')
await closeDb()
