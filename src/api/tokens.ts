import { request } from './http.ts'
import type { ApiTokenItem, CreateTokenRequest, CreatedToken } from '@shared/api/tokens.ts'

export const listTokens = (teamId: number) => request<ApiTokenItem[]>(`/teams/${teamId}/tokens`)
export const createToken = (teamId: number, body: CreateTokenRequest) => request<CreatedToken>(`/teams/${teamId}/tokens`, { method: 'POST', body })
export const revokeToken = (teamId: number, id: number) => request<ApiTokenItem>(`/teams/${teamId}/tokens/${id}`, { method: 'DELETE' })
