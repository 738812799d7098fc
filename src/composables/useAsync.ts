import { ref, shallowRef } from 'vue'
import { ApiRequestError } from '../api/client'

/**
 * Wraps an async action: `active` while it runs, `error` when it failed.
 * `run` resolves to the result, or undefined after a failure (the failure is in `error`).
 */
export function useAsync<Args extends unknown[], T>(action: (...args: Args) => Promise<T>) {
  const active = ref(false)
  const error = shallowRef<ApiRequestError | null>(null)

  async function run(...args: Args): Promise<T | undefined> {
    active.value = true
    error.value = null
    try {
      return await action(...args)
    } catch (caught) {
      error.value =
        caught instanceof ApiRequestError
          ? caught
          : new ApiRequestError(0, 'client', caught instanceof Error ? caught.message : 'Something went wrong on this page.')
      return undefined
    } finally {
      active.value = false
    }
  }

  return { active, error, run }
}
