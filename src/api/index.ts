// One typed function per endpoint of the HTTP contract, grouped by area.
export * from './http.ts'
export type * from './types.ts'
export * as authApi from './auth.ts'
export * as teamsApi from './teams.ts'
export * as starsApi from './stars.ts'
export * as measurementsApi from './measurements.ts'
export * as uploadsApi from './uploads.ts'
export * as devApi from './dev.ts'
