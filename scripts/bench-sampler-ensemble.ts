// One ensemble of the parallel-mode bench row (scripts/bench-sampler.ts `benchEnsembles`), in a
// worker thread: samples the bench's posterior from its own seed and posts its kept rows every
// 500 steps until the main thread says stop (the merge rule passed) or the budget runs out.
import { parentPort, workerData } from 'node:worker_threads'
import { fitKeplerians, type RvData, type PlanetStart } from '../shared/rv/index.ts'
import { samplePosterior } from '../shared/rv/mcmc.ts'

interface Job { data: RvData; planets: PlanetStart[]; walkers: number; seed: number; steps: number; stop: SharedArrayBuffer }

if (parentPort && (workerData as { ensembleBench?: Job })?.ensembleBench) {
  const job = (workerData as { ensembleBench: Job }).ensembleBench
  const port = parentPort
  const stop = new Int32Array(job.stop)
  const fit = fitKeplerians(job.data, { planets: job.planets })
  samplePosterior(job.data, fit, {
    walkers: job.walkers, seed: job.seed, steps: job.steps, untilConverged: false, progressEvery: 100,
    onProgress: (p) => {
      if (p.step % 500 === 0) port.postMessage({ step: p.step, rows: p.store.takePending() })
      return Atomics.load(stop, 0) ? 'stop' : undefined
    },
  })
  port.postMessage({ done: true })
}
