// Background threads (compute pool, sampling, limits, merges, PDFs) run at a lower scheduling
// priority than the API's main thread and PostgreSQL, so a long fit on a small machine does not
// lengthen the tail of cheap reads. On Linux the nice value is per thread (setpriority(2), NPTL), and
// os.setPriority(0, …) called inside a worker thread applies to that thread only; elsewhere it may
// apply to the whole process or be refused, so it is used only on Linux and any refusal is ignored.
import { getPriority, setPriority } from 'node:os'
import { isMainThread } from 'node:worker_threads'

/**
 * Nice value of background threads (0 normal, 19 lowest). 19: a thread at nice 19 gets ~1.5 % of a
 * core against one at 0 (CFS weights 15 vs 1024), at 10 ~10 %; the 50-user load's read p99 fell from
 * 305–416 ms to 275–340 ms with 19 and the Unix socket together, and fits and periodograms (which
 * have the idle core between bursts) stayed far under their 2 s (issue 11, scripts/load.ts).
 */
export const BACKGROUND_NICE = 19

/** Lowers the calling worker thread's priority; a no-op on the main thread and off Linux. */
export function lowerThreadPriority(nice = BACKGROUND_NICE): boolean {
  if (isMainThread || process.platform !== 'linux') return false
  try {
    setPriority(0, Math.max(nice, getPriority(0))) // never raise it: that needs privileges
    return true
  } catch {
    return false
  }
}
