// Event-loop delay of the API process (perf_hooks.monitorEventLoopDelay), kept as 10-s windows
// over the last minute so /api/health can say how long requests waited for the loop lately
// (scripts/load.ts prints it). Started by server/index.ts; reading it is a few numbers, no I/O.
import { monitorEventLoopDelay, type IntervalHistogram } from 'node:perf_hooks'

const WINDOW_MS = 10_000
const WINDOWS = 6
interface Window { p99: number; max: number }

let monitor: IntervalHistogram | null = null
const windows: Window[] = []

const ms = (ns: number) => Math.round(ns / 1e4) / 100

function rotate(): void {
  if (!monitor) return
  windows.push({ p99: monitor.percentile(99), max: monitor.max })
  if (windows.length > WINDOWS) windows.shift()
  monitor.reset()
}

/** Starts measuring (10 ms resolution); idempotent. The timer does not keep the process alive. */
export function startLoopDelay(): void {
  if (monitor) return
  monitor = monitorEventLoopDelay({ resolution: 10 })
  monitor.enable()
  setInterval(rotate, WINDOW_MS).unref()
}

/**
 * Over the last minute (the finished 10-s windows): the worst window's 99th percentile and the
 * largest delay, in ms. Null when not measuring or before the first window ends.
 */
export function loopDelay(): { p99Ms: number; maxMs: number; seconds: number } | null {
  if (!monitor || windows.length === 0) return null
  return {
    p99Ms: ms(Math.max(...windows.map((w) => w.p99))),
    maxMs: ms(Math.max(...windows.map((w) => w.max))),
    seconds: (windows.length * WINDOW_MS) / 1000,
  }
}
