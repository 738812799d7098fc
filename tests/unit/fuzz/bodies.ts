import fc from 'fast-check'

type Json = null | boolean | number | string | Json[] | { [k: string]: Json }
type Path = (string | number)[]

/** Every path into a JSON value (objects' keys and arrays' indexes), the root included. */
export function pathsOf(v: unknown, at: Path = []): Path[] {
  const out: Path[] = [at]
  if (Array.isArray(v)) v.forEach((x, i) => out.push(...pathsOf(x, [...at, i])))
  else if (v && typeof v === 'object') for (const [k, x] of Object.entries(v)) out.push(...pathsOf(x, [...at, k]))
  return out
}

function setAt(root: Json, path: Path, value: Json | undefined): Json {
  if (!path.length) return value === undefined ? {} : value
  const copy: Json = structuredClone(root)
  let node = copy as Record<string | number, Json>
  for (const p of path.slice(0, -1)) {
    const next = node?.[p]
    if (!next || typeof next !== 'object') return copy // an earlier edit removed or replaced this branch
    node = next as Record<string | number, Json>
  }
  if (!node || typeof node !== 'object') return copy
  const last = path[path.length - 1]
  if (value === undefined) {
    if (Array.isArray(node)) node.splice(Number(last), 1)
    else delete node[last]
  } else node[last] = value
  return copy
}

/** Values that tend to break hand-written code: edge numbers, empty and huge strings, wrong shapes, deep nesting. */
export const nasty: fc.Arbitrary<Json> = fc.oneof(
  fc.constantFrom<Json>(null, true, false, 0, -0, -1, 1.5, 1e308, -1e308, 2 ** 53 + 1, '', ' ', '0', 'NaN', 'Infinity', 'true', 'null', '[]', '{}',
    '00000000-0000-0000-0000-000000000000', 'ffffffff-ffff-ffff-ffff-ffffffffffff', '../../etc/passwd', '\u0000', '\u202e', "'; DROP TABLE cases; --", '%00', '$1', '{{listener.name}}',
    'x'.repeat(20_001), 'é'.repeat(5000), [], {}, [[[[[[[[[[[]]]]]]]]]]], { $gt: '' }, { toString: 'x' }, { constructor: { prototype: { admin: true } } }),
  fc.string({ unit: 'binary', maxLength: 80 }),
  fc.integer(),
  fc.double(),
  fc.jsonValue({ maxDepth: 3 }) as fc.Arbitrary<Json>,
)

/**
 * A JSON body near a valid one: a value replaced by something nasty, a key removed, an unknown
 * key (or `__proto__`) added; or anything at all (also not an object). Returned as JSON text so
 * `__proto__` arrives as an own property, as an attacker would send it.
 */
export function bodyNear(valid: unknown): fc.Arbitrary<string> {
  const paths = pathsOf(valid)
  const edit = fc.oneof(
    fc.record({ op: fc.constant('set' as const), path: fc.constantFrom(...paths), value: nasty }),
    fc.record({ op: fc.constant('drop' as const), path: fc.constantFrom(...paths.filter((p) => p.length > 0)) }),
    fc.record({ op: fc.constant('add' as const), key: fc.constantFrom('__proto__', 'constructor', 'role', 'id', 'listenerId', 'status', 'ownerId', 'extra'), value: nasty }),
  )
  const near = fc.array(edit, { minLength: 1, maxLength: 3 }).map((edits) => {
    let body = structuredClone(valid) as Json
    let proto: string | undefined
    for (const e of edits) {
      if (e.op === 'add') {
        if (e.key === '__proto__') proto = JSON.stringify(e.value)
        else if (body && typeof body === 'object' && !Array.isArray(body)) body = { ...body, [e.key]: e.value }
      } else body = setAt(body, e.path, e.op === 'set' ? e.value : undefined)
    }
    const text = JSON.stringify(body) ?? 'null'
    return proto !== undefined && text.startsWith('{') ? `{"__proto__":${proto}${text === '{}' ? '' : ','}${text.slice(1)}` : text
  })
  return fc.oneof({ weight: 4, arbitrary: near }, { weight: 1, arbitrary: nasty.map((v) => JSON.stringify(v)) })
}

/** JSON.parse that keeps `__proto__` as an own key (as body-parser does). */
export const parseJson = (text: string): unknown => JSON.parse(text)
