/**
 * Writes the two snapshots that tests/api/schema-migrations.test.ts checks the migrations against,
 * each built in a throwaway PostgreSQL cluster of its own:
 *
 *   npx tsx server/dev/schema-snapshot.ts            tests/fixtures/schema/schema.json: the catalog
 *       (server/dev/schema-catalog.ts) of a fresh database built by this tree's migrations. Run it after
 *       adding a migration and commit the file; its diff is exactly what the new migration does, and a
 *       diff anywhere else means an applied migration's effect changed (which must not happen).
 *   npx tsx server/dev/schema-snapshot.ts --demo REV tests/fixtures/schema/demo-earlier.sql.gz: a plain-SQL
 *       pg_dump (INSERTs, no owners) of the database that commit REV's own migrations and demo seed
 *       build, i.e. an earlier version's demo database with its rows. Rarely needed: only to move the
 *       "earlier version" forward.
 */
import { gzipSync } from 'node:zlib'
import { execFileSync, spawnSync } from 'node:child_process'
import { mkdtempSync, rmSync, symlinkSync, writeFileSync, mkdirSync, chmodSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { dirname, join, resolve } from 'node:path'
import { fileURLToPath } from 'node:url'
import { Sequelize } from 'sequelize'
import { ensureDatabase, freePort, startCluster } from './cluster'
import { readCatalog, type Catalog } from './schema-catalog'
import { migrator } from '../db/migrate'

const repo = resolve(dirname(fileURLToPath(import.meta.url)), '../..')
const snapshotDir = join(repo, 'tests/fixtures/schema')
const say = (m: string) => console.log(`[snapshot] ${m}`)

/** One row a line, so that a migration's diff of the snapshot reads row by row. */
function formatCatalog(c: Catalog): string {
  const parts = Object.entries(c).map(([k, rows]) => `  ${JSON.stringify(k)}: [\n${rows.map((r) => `    ${JSON.stringify(r)}`).join(',\n')}\n  ]`)
  return `{\n${parts.join(',\n')}\n}\n`
}

async function writeSchema(url: string) {
  const s = new Sequelize(url, { dialect: 'postgres', logging: false })
  try {
    await migrator(s).up()
    const file = join(snapshotDir, 'schema.json')
    writeFileSync(file, formatCatalog(await readCatalog(s)))
    say(`wrote ${file}`)
  } finally {
    await s.close()
  }
}

/** REV's tree (git archive), its migrations and demo seed run by its own code against `url`, then pg_dump. */
function writeDemo(rev: string, url: string, home: string) {
  const commit = execFileSync('git', ['rev-parse', '--short', `${rev}^{commit}`], { cwd: repo, encoding: 'utf8' }).trim()
  const src = join(home, 'src')
  mkdirSync(src)
  execFileSync('sh', ['-c', `git archive ${commit} | tar -x -C "${src}"`], { cwd: repo })
  symlinkSync(join(repo, 'node_modules'), join(src, 'node_modules'))
  writeFileSync(join(src, 'snapshot-seed.ts'), [
    "import { migrateUp } from './server/db/migrate'",
    "import { seedDemo } from './server/seed'",
    'console.log(`migrations: ${(await migrateUp()).join(" ")}`)',
    'console.log(`seed steps: ${(await seedDemo()).join(" ")}`)',
    'process.exit(0)',
  ].join('\n'))
  say(`migrating and seeding with the code of ${commit}…`)
  const r = spawnSync(process.execPath, [join(repo, 'node_modules/tsx/dist/cli.mjs'), 'snapshot-seed.ts'], {
    cwd: src, encoding: 'utf8',
    env: { ...process.env, NODE_ENV: 'development', DATABASE_URL: url, STORAGE_DIR: join(home, 'storage'), FAKE_SMTP: 'off' },
  })
  if (r.status !== 0) throw new Error(`seeding at ${commit} failed:\n${r.stderr || r.stdout}`)
  const ran = r.stdout.trim().split('\n').filter((l) => /^(migrations|seed steps):/.test(l))
  // Plain SQL a client can run as one script: INSERTs rather than COPY, no owners or grants, no psql meta-commands.
  const dump = execFileSync('pg_dump', ['--dbname', url, '--no-owner', '--no-privileges', '--inserts', '--rows-per-insert=100', '--exclude-schema=pgboss'], {
    encoding: 'utf8', maxBuffer: 512 * 1024 * 1024,
  })
  const body = dump.split('\n').filter((l) => !l.startsWith('\\')).join('\n')
  const file = join(snapshotDir, 'demo-earlier.sql.gz')
  // gzip: the plain SQL is ~6 MB, compressed ~1.3 MB in the repository
  writeFileSync(file, gzipSync([
    `-- The demo database of Roomwright at commit ${commit}, built by that commit's own migrations and demo seed.`,
    `-- Written by server/dev/schema-snapshot.ts --demo ${rev}; data for tests/api/schema-migrations.test.ts, do not edit.`,
    ...ran.map((l) => `-- ${l}`),
    body,
  ].join('\n'), { level: 9 }))
  say(`wrote ${file} (${ran.join('; ')})`)
}

async function main() {
  const i = process.argv.indexOf('--demo')
  const rev = i >= 0 ? process.argv[i + 1] : undefined
  if (i >= 0 && !rev) throw new Error('--demo needs a commit, e.g. --demo c8ae6bf')
  const home = mkdtempSync(join(tmpdir(), 'roomwright-snapshot-'))
  chmodSync(home, 0o755)
  const cluster = await startCluster({ dir: join(home, 'pg'), port: await freePort(), say })
  try {
    mkdirSync(snapshotDir, { recursive: true })
    if (rev) {
      await ensureDatabase(cluster.url('postgres'), 'snapshot_demo')
      writeDemo(rev, cluster.url('snapshot_demo'), home)
    } else {
      await ensureDatabase(cluster.url('postgres'), 'snapshot_schema')
      await writeSchema(cluster.url('snapshot_schema'))
    }
  } finally {
    cluster.stop()
    rmSync(home, { recursive: true, force: true })
  }
}

main().then(() => process.exit(0), (e) => { console.error(e); process.exit(1) })
