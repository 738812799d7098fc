/** Polls `fn` every `everyMs` until it gives a value, or fails after `ms` naming `what`. */
export async function waitFor<T>(what: string, fn: () => Promise<T | undefined | null | false>, ms = 30_000, everyMs = 300): Promise<T> {
  const until = Date.now() + ms
  for (;;) {
    const v = await fn()
    if (v) return v
    if (Date.now() > until) throw new Error(`timed out waiting for ${what}`)
    await new Promise((r) => setTimeout(r, everyMs))
  }
}
