// The worker-thread pool that runs the numerical core off the event loop.
import { afterAll, describe, expect, it } from 'vitest'
import { ComputePool, ComputeError, ComputeTimeoutError } from '../../server/compute/pool.ts'
import { downsampleCurve } from '../../server/compute/tasks.ts'
import { createRandom } from '../../shared/math/random.ts'

const pool = new ComputePool({ size: 2, timeoutMs: 20_000 })
afterAll(async () => { await pool.close() })

describe('compute pool', () => {
  it('runs a periodogram in a worker and returns plain data', async () => {
    const rnd = createRandom(7)
    const n = 80
    const t = new Float64Array(n), y = new Float64Array(n), dy = new Float64Array(n).fill(1)
    for (let i = 0; i < n; i++) { t[i] = 2459000 + i * 3.1 + rnd.next(); y[i] = 5 * Math.sin((2 * Math.PI * t[i]) / 17.3) + rnd.normal() }
    const r = await pool.run('periodogram', { t, y, dy })
    // synthetic sinusoid of period 17.3 d (this test's own data)
    expect(Math.abs(r.peaks[0]!.period - 17.3)).toBeLessThan(0.2)
    expect(r.fapLevels.map((l) => l.fap)).toEqual([0.1, 0.01, 0.001])
    expect(r.fapLevels[0]!.power).toBeLessThan(r.fapLevels[2]!.power)
    expect(r.curve.period.length).toBeLessThanOrEqual(4000)
  })

  it('keeps the event loop free while a task runs, and queues beyond its size', async () => {
    const started = Date.now()
    const jobs = [pool.run('spin', { ms: 600 }), pool.run('spin', { ms: 600 }), pool.run('spin', { ms: 600 })]
    // the main thread keeps ticking: a 10 ms timer fires on time while the workers spin
    const lag = await new Promise<number>((r) => { const t0 = Date.now(); setTimeout(() => r(Date.now() - t0 - 10), 10) })
    expect(lag).toBeLessThan(200)
    expect(pool.stats().queued).toBe(1)
    await Promise.all(jobs)
    // three 600 ms jobs on two workers take two rounds
    expect(Date.now() - started).toBeGreaterThanOrEqual(1150)
  })

  it('propagates a task error as a typed error naming the task', async () => {
    const err = await pool.run('spin', { ms: 1, fail: 'period must be > 0' }).catch((e) => e)
    expect(err).toBeInstanceOf(ComputeError)
    expect(err.status).toBe(500)
    expect(err.remoteName).toBe('RangeError')
    expect(err.message).toMatch(/spin computation failed: period must be > 0/)
  })

  it('stops a task past its time limit and keeps working afterwards', async () => {
    const err = await pool.run('spin', { ms: 5000 }, { timeoutMs: 300 }).catch((e) => e)
    expect(err).toBeInstanceOf(ComputeTimeoutError)
    expect(err.status).toBe(503)
    expect(err.message).toMatch(/limit of 0.3 s/)
    await expect(pool.run('spin', { ms: 1 })).resolves.toHaveProperty('spun')
  })

  it('refuses a size below 1', () => {
    expect(() => new ComputePool({ size: 0 })).toThrow(/size/)
  })
})

describe('recycling', () => {
  /** A long grid (≈ 300 000 frequencies): several MB in the worker. */
  function large() {
    const rnd = createRandom(11)
    const n = 120
    const t = new Float64Array(n), y = new Float64Array(n), dy = new Float64Array(n).fill(1)
    for (let i = 0; i < n; i++) { t[i] = 2459000 + i * 25 + rnd.next(); y[i] = 5 * Math.sin(t[i]! / 3) + rnd.normal() }
    return { t, y, dy, minPeriod: 0.1, oversample: 10 }
  }

  it('replaces a worker whose heap passed the bound after a large job, and the next one starts small', async () => {
    const p = new ComputePool({ size: 1, timeoutMs: 120_000 })
    try {
      await p.run('spin', { ms: 1 })
      const small = p.stats().lastHeap
      expect(small).toBeGreaterThan(0)
      expect(p.stats().recycled).toBe(0)
      const big = await p.run('periodogram', large())
      expect(big.grid.count).toBeGreaterThan(200_000)
      const afterBig = p.stats().lastHeap
      expect(afterBig).toBeGreaterThan(small + 2_000_000)
      await p.close()
      // the same work with the bound between the two heaps: the worker is replaced after the big job
      const q = new ComputePool({ size: 1, timeoutMs: 120_000, recycleHeapBytes: Math.round((small + afterBig) / 2) })
      try {
        await q.run('spin', { ms: 1 })
        expect(q.stats()).toMatchObject({ recycled: 0, workers: 1 })
        await q.run('periodogram', large())
        expect(q.stats()).toMatchObject({ recycled: 1, workers: 0 })
        await q.run('spin', { ms: 1 })
        expect(q.stats().lastHeap).toBeLessThan(afterBig)
        expect(q.stats()).toMatchObject({ recycled: 1, workers: 1 })
      } finally { await q.close() }
    } finally { await p.close() }
  }, 300_000)

  it('replaces the worker after a job run with recycle: true, whatever its heap', async () => {
    const p = new ComputePool({ size: 1 })
    try {
      await p.run('spin', { ms: 1 }, { recycle: true })
      expect(p.stats()).toMatchObject({ recycled: 1, workers: 0 })
      await expect(p.run('spin', { ms: 1 })).resolves.toHaveProperty('spun')
      expect(p.stats()).toMatchObject({ recycled: 1, workers: 1 })
    } finally { await p.close() }
  })
})

describe('downsampleCurve', () => {
  it('keeps every bin extreme, so the highest point survives, in increasing period', () => {
    const m = 10_001
    const f = new Float64Array(m), p = new Float64Array(m)
    for (let k = 0; k < m; k++) { f[k] = 0.01 + k * 1e-4; p[k] = 0.5 + 0.4 * Math.sin(k / 7) }
    p[7777] = 0.99
    const c = downsampleCurve(f, p)
    expect(c.power.length).toBeLessThanOrEqual(4000)
    expect(Math.max(...c.power)).toBe(0.99)
    for (let i = 1; i < c.period.length; i++) expect(c.period[i]!).toBeGreaterThan(c.period[i - 1]!)
  })
})
