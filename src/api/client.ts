import type { ZodType } from 'zod'
import { csrfSchema } from '../../shared/schemas/auth'
import { apiErrorSchema, type ApiError } from '../../shared/schemas/errors'

export type FieldError = NonNullable<ApiError['error']['fields']>[number]
export type HttpMethod = 'GET' | 'POST' | 'PUT' | 'PATCH' | 'DELETE'
export type QueryParams = Record<string, string | number | boolean | null | undefined>

/** Every failed request ends as one of these, network failures included (status 0, code 'network'). */
export class ApiRequestError extends Error {
  override readonly name = 'ApiRequestError'
  readonly status: number
  readonly code: string
  readonly fields: FieldError[]

  constructor(status: number, code: string, message: string, fields: FieldError[] = []) {
    super(message)
    this.status = status
    this.code = code
    this.fields = fields
  }

  /** The server's message for one field path (e.g. 'email'), if it named that field. */
  fieldMessage(path: string): string | undefined {
    return this.fields.find((field) => field.path === path)?.message
  }
}

export interface RequestOptions<T> {
  query?: QueryParams
  /** JSON-serialisable value, or FormData for uploads. */
  body?: unknown
  /** Checks the response body at runtime; use the shared zod schema of the answer. */
  schema?: ZodType<T>
  signal?: AbortSignal
  /**
   * Set false where 401 is an expected answer (the session check, a wrong password)
   * rather than a lapsed session; otherwise a 401 calls the handler set with onUnauthorized.
   */
  notifyUnauthorized?: boolean
}

let unauthorizedHandler: (() => void) | null = null

/** The auth store registers the one reaction to a lapsed session here. */
export function onUnauthorized(handler: () => void): void {
  unauthorizedHandler = handler
}

let csrfToken: Promise<string> | null = null

/** Drop the cached CSRF token, e.g. after sign-in or sign-out when the session changes. */
export function forgetCsrfToken(): void {
  csrfToken = null
}

function currentCsrfToken(): Promise<string> {
  csrfToken ??= fetchCsrfToken().catch((error: unknown) => {
    csrfToken = null
    throw error
  })
  return csrfToken
}

async function fetchCsrfToken(): Promise<string> {
  const response = await transmit('/api/auth/csrf', { method: 'GET', headers: { Accept: 'application/json' } })
  if (!response.ok) throw await errorFrom(response)
  return (await readBody(response, csrfSchema)).token
}

const changesState = (method: HttpMethod) => method !== 'GET'

function urlFor(path: string, query?: QueryParams): string {
  if (!query) return path
  const params = new URLSearchParams()
  for (const [key, value] of Object.entries(query)) {
    if (value !== undefined && value !== null) params.append(key, String(value))
  }
  const search = params.toString()
  return search ? `${path}?${search}` : path
}

async function transmit(url: string, init: RequestInit): Promise<Response> {
  try {
    return await fetch(url, { ...init, credentials: 'same-origin' })
  } catch (error) {
    if (error instanceof DOMException && error.name === 'AbortError') throw error
    throw new ApiRequestError(0, 'network', 'Roomwright could not be reached. Check your connection and try again.')
  }
}

async function errorFrom(response: Response): Promise<ApiRequestError> {
  const parsed = apiErrorSchema.safeParse(await response.json().catch(() => null))
  if (parsed.success) {
    const { code, message, fields } = parsed.data.error
    return new ApiRequestError(response.status, code, message, fields)
  }
  return new ApiRequestError(
    response.status,
    'unexpected_response',
    `Roomwright answered with an error (HTTP ${response.status}). Try again in a moment.`,
  )
}

async function readBody<T>(response: Response, schema?: ZodType<T>): Promise<T> {
  if (response.status === 204) return undefined as T
  const text = await response.text()
  if (!text) return undefined as T
  let value: unknown
  try {
    value = JSON.parse(text)
  } catch {
    throw new ApiRequestError(response.status, 'unexpected_response', 'Roomwright sent an answer this page cannot read. Reload and try again.')
  }
  if (!schema) return value as T
  const checked = schema.safeParse(value)
  if (!checked.success) {
    throw new ApiRequestError(response.status, 'unexpected_response', 'Roomwright sent an answer this page does not understand. Reload and try again.')
  }
  return checked.data
}

/**
 * GET answers asked for before anyone needs them: a page's first data, requested by the router while the
 * page's own code is still on its way (./early.ts), so the two no longer come one after the other. The
 * first GET of the same URL takes the answer (once). What is not taken within EARLY_MS is not used, and a new
 * navigation, any request that changes something, or a live event (../stores/live.ts) drops them all, so an
 * answer that may predate a change is never shown.
 */
const early = new Map<string, { at: number; answer: Promise<Response> }>()
const EARLY_MS = 5000

/** Starts the GETs of these URLs now; the page's own requests for them pick the answers up. */
export function fetchEarly(urls: readonly string[]): void {
  const now = Date.now()
  for (const url of urls) {
    if (early.has(url)) continue
    const answer = transmit(url, { method: 'GET', headers: { Accept: 'application/json' } })
    answer.catch(() => {}) // an answer nobody takes fails quietly; the page's own request reports it
    early.set(url, { at: now, answer })
  }
}

/** Drops the early answers nobody took (a new navigation, or a change made on the server). */
export function forgetEarly(): void {
  early.clear()
}

function takeEarly(url: string): Promise<Response> | undefined {
  const entry = early.get(url)
  if (!entry) return undefined
  early.delete(url)
  return Date.now() - entry.at <= EARLY_MS ? entry.answer : undefined
}

/** The one way the client talks to the server. Components call the typed functions in src/api/, not this. */
export async function request<T = unknown>(method: HttpMethod, path: string, options: RequestOptions<T> = {}): Promise<T> {
  const isForm = typeof FormData !== 'undefined' && options.body instanceof FormData
  const url = urlFor(path, options.query)
  if (changesState(method)) forgetEarly()

  for (let attempt = 1; ; attempt++) {
    const headers: Record<string, string> = { Accept: 'application/json' }
    if (options.body !== undefined && !isForm) headers['Content-Type'] = 'application/json'
    if (changesState(method)) headers['X-CSRF-Token'] = await currentCsrfToken()

    const taken = method === 'GET' && attempt === 1 && !options.signal ? takeEarly(url) : undefined
    const response = await (taken ?? transmit(url, {
      method,
      headers,
      body: options.body === undefined ? undefined : isForm ? (options.body as FormData) : JSON.stringify(options.body),
      signal: options.signal,
    }))
    if (response.ok) return readBody(response, options.schema)

    const error = await errorFrom(response)
    if (error.status === 403 && error.code === 'csrf' && changesState(method) && attempt === 1) {
      forgetCsrfToken()
      continue
    }
    if (error.status === 401 && options.notifyUnauthorized !== false) unauthorizedHandler?.()
    throw error
  }
}

export const api = {
  get: <T = unknown>(path: string, options?: Omit<RequestOptions<T>, 'body'>) => request<T>('GET', path, options),
  post: <T = unknown>(path: string, body?: unknown, options?: Omit<RequestOptions<T>, 'body'>) =>
    request<T>('POST', path, { ...options, body }),
  put: <T = unknown>(path: string, body?: unknown, options?: Omit<RequestOptions<T>, 'body'>) =>
    request<T>('PUT', path, { ...options, body }),
  patch: <T = unknown>(path: string, body?: unknown, options?: Omit<RequestOptions<T>, 'body'>) =>
    request<T>('PATCH', path, { ...options, body }),
  delete: <T = unknown>(path: string, options?: Omit<RequestOptions<T>, 'body'>) => request<T>('DELETE', path, options),
}

export interface UploadOptions<T> {
  /** Called as bytes leave the browser: loaded and total in bytes (total 0 when the browser cannot tell). */
  onProgress?: (loaded: number, total: number) => void
  schema?: ZodType<T>
  signal?: AbortSignal
}

function sendForm(url: string, formData: FormData, token: string, options: UploadOptions<unknown>): Promise<{ status: number; text: string }> {
  return new Promise((resolve, reject) => {
    const xhr = new XMLHttpRequest()
    xhr.open('POST', url)
    xhr.withCredentials = true
    xhr.setRequestHeader('Accept', 'application/json')
    xhr.setRequestHeader('X-CSRF-Token', token)
    xhr.upload.onprogress = (event) => options.onProgress?.(event.loaded, event.lengthComputable ? event.total : 0)
    xhr.onload = () => resolve({ status: xhr.status, text: xhr.responseText })
    xhr.onerror = () => reject(new ApiRequestError(0, 'network', 'The upload did not reach Roomwright. Check your connection and try again.'))
    xhr.onabort = () => reject(new DOMException('The upload was cancelled', 'AbortError'))
    options.signal?.addEventListener('abort', () => xhr.abort(), { once: true })
    xhr.send(formData)
  })
}

/**
 * POSTs a multipart form with upload progress (fetch cannot report it), with the same CSRF
 * handling and error shape as `request`.
 */
export async function upload<T = unknown>(path: string, formData: FormData, options: UploadOptions<T> = {}): Promise<T> {
  forgetEarly()
  for (let attempt = 1; ; attempt++) {
    const { status, text } = await sendForm(path, formData, await currentCsrfToken(), options as UploadOptions<unknown>)
    if (status < 200 || status > 599) throw new ApiRequestError(0, 'network', 'The upload did not reach Roomwright. Check your connection and try again.')
    const response = new Response(status === 204 ? null : text, { status })
    if (response.ok) return readBody(response, options.schema)
    const error = await errorFrom(response)
    if (error.status === 403 && error.code === 'csrf' && attempt === 1) {
      forgetCsrfToken()
      continue
    }
    if (error.status === 401) unauthorizedHandler?.()
    throw error
  }
}
