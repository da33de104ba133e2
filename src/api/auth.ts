import { request } from './http.ts'
import type { Me, User } from './types.ts'

export const register = (body: { email: string; password: string; name: string; inviteToken?: string }) =>
  request<{ user: User }>('/auth/register', { method: 'POST', body })
export const signIn = (body: { email: string; password: string }) =>
  request<{ user: User }>('/auth/login', { method: 'POST', body })
export const signOut = () => request<void>('/auth/logout', { method: 'POST' })
export const fetchMe = () => request<Me>('/auth/me')
export const changePassword = (body: { currentPassword: string; newPassword: string }) =>
  request<void>('/auth/password', { method: 'POST', body })
export const requestReset = (body: { email: string }) => request<void>('/auth/reset-request', { method: 'POST', body })
export const resetPassword = (body: { token: string; newPassword: string }) =>
  request<void>('/auth/reset', { method: 'POST', body })
