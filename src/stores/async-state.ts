import { reactive } from 'vue'
import { ApiError, errorMessage } from '@/api/http.ts'

/** The shape of every piece of fetched state: what arrived, what went wrong, and whether we are waiting. */
export interface AsyncState<T> {
  data: T | null
  error: string | null
  /** The last failure as the API reported it (status, code, field), for callers that branch on it. */
  apiError: ApiError | null
  isLoading: boolean
}

export function asyncState<T>(initial: T | null = null): AsyncState<T> {
  return reactive({ data: initial, error: null, apiError: null, isLoading: false }) as AsyncState<T>
}

/**
 * Runs `load` and records its outcome in `state`. Errors are kept for the screen and rethrown only
 * when `rethrow` is set, so views can await without try/catch.
 */
export async function track<T>(state: AsyncState<T>, load: () => Promise<T>, rethrow = false): Promise<T | null> {
  state.isLoading = true
  state.error = null
  state.apiError = null
  try {
    const value = await load()
    state.data = value
    return value
  } catch (error) {
    state.error = errorMessage(error)
    state.apiError = error instanceof ApiError ? error : null
    if (rethrow) throw error
    return null
  } finally {
    state.isLoading = false
  }
}
