import { sha256Hex } from './sha256.ts'

export interface HashedPoint { id: number; time: number; rv: number; error: number }
export interface HashedExclusion { id: number; reason: string | null }

/**
 * Content hash of a report's data: SHA-256 over one line per included measurement
 * `m <id> <time> <rv> <error>` (ids ascending, numbers in JavaScript's shortest round-trip form)
 * followed by one line per exclusion `x <id> <reason>` (ids ascending). The same data give the same
 * hash in the browser and on the server; any changed value, point or reason changes it.
 */
export function dataContentHash(points: readonly HashedPoint[], exclusions: readonly HashedExclusion[]): string {
  const lines = [...points].sort((a, b) => a.id - b.id).map((p) => `m ${p.id} ${p.time} ${p.rv} ${p.error}`)
  for (const x of [...exclusions].sort((a, b) => a.id - b.id)) lines.push(`x ${x.id} ${(x.reason ?? '').replace(/\s+/g, ' ')}`)
  return sha256Hex(lines.join('\n'))
}
