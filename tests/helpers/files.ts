import { existsSync, readdirSync } from 'node:fs'
import { join } from 'node:path'

/** Every file below `root` (none when it does not exist), to count what the storage holds. */
export function filesUnder(root: string): string[] {
  const out: string[] = []
  const walk = (d: string) => {
    if (!existsSync(d)) return
    for (const e of readdirSync(d, { withFileTypes: true })) e.isDirectory() ? walk(join(d, e.name)) : out.push(join(d, e.name))
  }
  walk(root)
  return out
}
