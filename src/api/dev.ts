import { request } from './http.ts'
import type { DevMailMessage } from '@shared/api/misc.ts'

/** Messages the local mail server received; answers only outside production. */
export const listDevMail = () => request<DevMailMessage[]>('/dev/mail')
