import { readFileSync } from 'node:fs'
import { fileURLToPath } from 'node:url'

/** Text of a file under fixtures/ (tests never read /work/shared). */
export function fixture(path: string): string {
  return readFileSync(fileURLToPath(new URL(`../../../fixtures/${path}`, import.meta.url)), 'utf8')
}

/** Bytes of a file under fixtures/. */
export function fixtureBytes(path: string): Uint8Array {
  return readFileSync(fileURLToPath(new URL(`../../../fixtures/${path}`, import.meta.url)))
}
