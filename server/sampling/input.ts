// The frozen input of a run as the core's data (no side effects: thread.ts runs a sampler when
// loaded in a worker thread, so the merge thread takes this from here).
import type { RvData } from '../../shared/rv/index.ts'
import type { SamplingInput } from '../db/models-sampling.ts'

export function rvDataOf(input: SamplingInput): RvData {
  const d = input.data
  return {
    t: Float64Array.from(d.t), y: Float64Array.from(d.y), dy: Float64Array.from(d.dy),
    instrument: Int32Array.from(d.instrument), instrumentNames: d.instrumentNames,
  }
}
