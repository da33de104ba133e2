import { defineStore } from 'pinia'
import { ref } from 'vue'
import * as api from '@/api/tokens.ts'
import type { ApiTokenItem, CreateTokenRequest } from '@shared/api/tokens.ts'
import { asyncState, track } from './async-state.ts'

/** The signed-in member's personal API tokens in the current team (owners see every member's). */
export const useTokensStore = defineStore('tokens', () => {
  const list = asyncState<ApiTokenItem[]>([])
  const action = asyncState<unknown>()
  /** The token just created: shown once, never fetched again. */
  const fresh = ref<string | null>(null)

  async function load(teamId: number) { await track(list, () => api.listTokens(teamId)) }
  async function create(teamId: number, body: CreateTokenRequest) {
    const made = await track(action, () => api.createToken(teamId, body))
    if (made) { fresh.value = (made as { token: string }).token; await load(teamId) }
    return made
  }
  async function revoke(teamId: number, id: number) {
    if (await track(action, () => api.revokeToken(teamId, id))) await load(teamId)
  }
  return { list, action, fresh, load, create, revoke }
})
