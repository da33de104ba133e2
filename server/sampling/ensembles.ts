// Parallel mode of a sampling run: the run (the "parallel run") is split into K independent
// ensembles, each a run of its own on the sampling queue (own seed, own job, resumable like any
// run) whose settings name the parallel run (`settings.ensemble`). The ensembles run to the
// budget; after each of their checkpoints the coordinator below merges every ensemble's kept rows
// (shared/rv/ensemble-merge.ts, in a worker thread) and, once the rule passes across them (pooled
// N > 50 τ, split-R̂ across ensembles < 1.01), stores the merged result on the parallel run, which
// the ensembles read as their signal to stop. Cancel stops them all; when every ensemble has ended
// without the rule passing (budget, cancel) the merged rows so far are stored with warnings.
import { QueryTypes } from 'sequelize'
import type { Services } from '../services.ts'
import { samplingModels, type SamplingRun } from '../db/models-sampling.ts'
import { SAMPLING_DONE_STATES, type SamplingProgress, type SamplingSettings } from '../../shared/api/sampling.ts'
import { MIN_N_OVER_TAU } from '../../shared/rv/mcmc.ts'
import { loadChunks, notify } from './runner.ts'
import { mergeInThread } from './merge-thread.ts'
import type { MergeOutcome } from './merge.ts'

/** pg application_name prefix of a job worker's queue connections: `sw-jobs x<slots> <workerId>`. */
export const JOBS_APP_PREFIX = 'sw-jobs'
export function jobsAppName(workerId: string, slots: number): string {
  return `${JOBS_APP_PREFIX} x${slots} ${workerId}`.slice(0, 63)
}

/**
 * Job workers connected to the database now, counted in slots (runs they take at once): each
 * worker process's queue connections carry its name and slots (jobsAppName). The most ensembles a
 * parallel run may ask for.
 */
export async function workersSeen(s: Services): Promise<number> {
  const rows = await s.sequelize.query<{ name: string }>(
    `SELECT DISTINCT application_name AS name FROM pg_stat_activity WHERE datname = current_database() AND application_name LIKE :p`,
    { replacements: { p: `${JOBS_APP_PREFIX} x%` }, type: QueryTypes.SELECT },
  )
  return rows.reduce((n, r) => n + (Number(/^\S+ x(\d+) /.exec(r.name)?.[1]) || 0), 0)
}

export const isParallel = (settings: SamplingSettings): boolean => (settings.ensembles ?? 1) > 1
export const parentOf = (settings: SamplingSettings): number | null => settings.ensemble?.of ?? null

/** The ensembles of a parallel run, in order. */
export async function ensemblesOf(s: Services, parent: Pick<SamplingRun, 'id' | 'starId'>, withResult = false): Promise<SamplingRun[]> {
  const { SamplingRun } = samplingModels(s.sequelize, s.models)
  const exclude = ['input', 'checkpoint', 'checkpointChain', 'checkpointLnprob', ...(withResult ? [] : ['result'])]
  const rows = await SamplingRun.findAll({
    where: s.sequelize.and({ starId: parent.starId }, s.sequelize.literal(`(settings->'ensemble'->>'of')::int = ${Number(parent.id)}`)),
    attributes: { exclude }, order: [['id', 'ASC']],
  })
  return rows.sort((a, b) => a.settings.ensemble!.index - b.settings.ensemble!.index)
}

/**
 * The parallel run's progress as shown: the merge diagnostics stored by the latest check, with
 * each ensemble's live state, the steps every ensemble has done and the time left at the slowest one's speed.
 */
export function composeProgress(parent: SamplingRun, kids: SamplingRun[]): SamplingProgress {
  const stored = parent.progress ?? { stepsDone: 0, stepsTotal: parent.settings.steps, tau: null, etaSeconds: null, acceptance: null, updatedAt: new Date().toISOString() }
  const ens = kids.map((k) => ({
    index: k.settings.ensemble!.index, runId: k.id, state: k.state, stepsDone: k.progress?.stepsDone ?? 0,
    acceptance: k.progress?.acceptance ?? null, attempts: k.attempts,
  }))
  if (SAMPLING_DONE_STATES.includes(parent.state)) return { ...stored, ensembles: ens }
  const done = ens.length ? Math.min(...ens.map((e) => e.stepsDone)) : 0
  const accs = ens.map((e) => e.acceptance).filter((a): a is number => a !== null)
  // each ensemble's speed from its own progress (steps left over its time left)
  const rates = kids.map((k) => (k.progress && k.progress.etaSeconds && k.progress.etaSeconds > 0 ? (k.progress.stepsTotal - k.progress.stepsDone) / k.progress.etaSeconds : null)).filter((r): r is number => r !== null && r > 0)
  const target = stored.expectedSteps ?? parent.settings.steps
  const eta = rates.length ? Math.max(0, target - done) / Math.min(...rates) : null
  return {
    ...stored, stepsDone: Math.max(done, 0), stepsTotal: parent.settings.steps,
    acceptance: accs.length ? accs.reduce((a, b) => a + b, 0) / accs.length : null, etaSeconds: eta, ensembles: ens,
    updatedAt: new Date().toISOString(),
  }
}

const inFlight = new Map<number, Promise<void>>()
const lastCheck = new Map<number, number>()

/**
 * After a checkpoint of one of its ensembles: merges and checks the parallel run (at most one
 * check per run at a time in this process, and not more often than `minMs`). Never throws.
 */
export function scheduleMergeCheck(s: Services, parentId: number, minMs: number, log?: (m: string) => void): void {
  if (inFlight.has(parentId) || Date.now() - (lastCheck.get(parentId) ?? 0) < minMs) return
  lastCheck.set(parentId, Date.now())
  const p = mergeCheck(s, parentId, false)
    .catch((err) => log?.(`parallel sampling run ${parentId}: merge check failed: ${String(err)}`))
    .finally(() => inFlight.delete(parentId))
  inFlight.set(parentId, p)
}

/** Loads the parallel run with its input and ensembles (null when it has finished already). */
async function loadForMerge(s: Services, parentId: number) {
  const { SamplingRun } = samplingModels(s.sequelize, s.models)
  const parent = await SamplingRun.findByPk(parentId, { attributes: { exclude: ['checkpoint', 'checkpointChain', 'checkpointLnprob'] } })
  if (!parent || parent.result) return null
  const kids = await ensemblesOf(s, parent, true)
  return { parent, kids }
}

async function merge(s: Services, parent: SamplingRun, kids: SamplingRun[], stopped: boolean): Promise<MergeOutcome | null> {
  const parts = await Promise.all(kids.map(async (k) => (await loadChunks(s, k.id, 2 ** 31 - 1)).rows))
  if (parts.some((p) => p.steps.length < 8)) return null
  const acceptance = kids.map((k) => (k.result
    ? { mean: k.result.diagnostics.acceptance, min: k.result.diagnostics.acceptanceMin, max: k.result.diagnostics.acceptanceMax }
    : { mean: k.progress?.acceptance ?? null, min: null, max: null }))
  return mergeInThread({ input: parent.input, settings: parent.settings, parts, build: true, acceptance, stopped })
}

/**
 * Merges the ensembles' rows so far. `final`: every ensemble has ended, so the merged result is
 * stored whatever the rule says. Otherwise it is stored (and the run succeeds) only when the rule passes.
 */
export async function mergeCheck(s: Services, parentId: number, final: boolean): Promise<void> {
  const loaded = await loadForMerge(s, parentId)
  if (!loaded) return
  const { parent, kids } = loaded
  if (!final && SAMPLING_DONE_STATES.includes(parent.state)) return
  const cancelled = parent.state === 'cancelled'
  const out = await merge(s, parent, kids, cancelled)
  const { SamplingRun } = samplingModels(s.sequelize, s.models)
  if (!out) {
    if (final) {
      const failedKid = kids.find((k) => k.state === 'failed')
      await SamplingRun.update(
        { state: cancelled ? 'cancelled' : 'failed', finishedAt: new Date(), error: parent.error ?? (failedKid ? `Ensemble ${failedKid.settings.ensemble!.index + 1} failed: ${failedKid.error ?? 'unknown error'}` : 'The ensembles ended before keeping enough rows to merge.') },
        { where: { id: parent.id, result: null } },
      )
    }
    return
  }
  const c = out.check
  const fin = (v: number[]) => v.filter(Number.isFinite)
  const tau = fin(c.tau).length ? Math.max(...fin(c.tau)) : null
  const K = kids.length
  const progress: SamplingProgress = {
    stepsDone: c.step, stepsTotal: parent.settings.steps, tau,
    minNOverTau: fin(c.nOverTau).length === c.nOverTau.length ? Math.min(...c.nOverTau) : null,
    maxRhat: fin(c.rhat).length === c.rhat.length ? Math.max(...c.rhat) : null,
    expectedSteps: tau === null ? null : Math.min(parent.settings.steps, Math.max(c.step, Math.ceil((MIN_N_OVER_TAU * tau * 4) / 3 / K))),
    etaSeconds: null, acceptance: out.result?.diagnostics.acceptance ?? null, updatedAt: new Date().toISOString(),
  }
  // a fixed-length parallel run ends when its ensembles have done their steps, not at the rule
  if (!final && (!c.passed || parent.settings.untilConverged === false)) {
    await SamplingRun.update({ progress }, { where: { id: parent.id, result: null } })
    return
  }
  const failedKid = kids.find((k) => k.state === 'failed')
  if (final && failedKid && !c.passed && !cancelled) {
    await SamplingRun.update({ state: 'failed', progress, finishedAt: new Date(), error: `Ensemble ${failedKid.settings.ensemble!.index + 1} failed: ${failedKid.error ?? 'unknown error'}` }, { where: { id: parent.id, result: null } })
    return
  }
  const rows = out.chunk!
  const won = await s.sequelize.transaction(async (transaction) => {
    const [, n] = await s.sequelize.query(
      `UPDATE sampling_runs SET state = CASE WHEN state = 'cancelled' THEN 'cancelled' ELSE 'succeeded' END, result = :result::jsonb, progress = :progress::jsonb,
              checkpoint_step = :step, finished_at = COALESCE(finished_at, now()), updated_at = now()
        WHERE id = :id AND result IS NULL`,
      { replacements: { id: parent.id, step: c.step, result: JSON.stringify(out.result), progress: JSON.stringify({ ...progress, etaSeconds: 0 }) }, transaction },
    ) as unknown as [unknown, number]
    if (!n) return false
    const st = rows.steps
    await s.sequelize.query('DELETE FROM sampling_chunks WHERE run_id = :id', { replacements: { id: parent.id }, transaction })
    await s.sequelize.query(
      `INSERT INTO sampling_chunks (run_id, seq, first_step, last_step, n_rows, steps, chain, lnprob, created_at)
       VALUES (:id, 0, :first, :last, :n, :steps, :chain, :lnprob, now())`,
      {
        replacements: {
          id: parent.id, first: st[0] ?? 0, last: st[st.length - 1] ?? 0, n: st.length,
          steps: Buffer.from(st.buffer, st.byteOffset, st.byteLength), chain: Buffer.from(rows.chain.buffer, rows.chain.byteOffset, rows.chain.byteLength),
          lnprob: Buffer.from(rows.lnProb.buffer, rows.lnProb.byteOffset, rows.lnProb.byteLength),
        },
        transaction,
      },
    )
    return true
  })
  if (won) {
    const fresh = await SamplingRun.findByPk(parent.id)
    if (fresh && fresh.state === 'succeeded') await notify(s, fresh)
  }
}

/** When an ensemble has ended: once every ensemble of its parallel run has, the run is closed with the merged rows. */
export async function ensembleEnded(s: Services, parentId: number): Promise<void> {
  const { SamplingRun } = samplingModels(s.sequelize, s.models)
  const parent = await SamplingRun.findByPk(parentId, { attributes: ['id', 'starId', 'state'] })
  if (!parent) return
  const kids = await ensemblesOf(s, parent)
  if (!kids.every((k) => SAMPLING_DONE_STATES.includes(k.state))) return
  await inFlight.get(parentId)
  await mergeCheck(s, parentId, true)
}

/** Cancels every ensemble still queued or running (the parallel run has been cancelled). Returns their ids and job ids. */
export async function cancelEnsembles(s: Services, parent: SamplingRun, actorName: string): Promise<Array<{ id: number; jobId: string | null; was: string }>> {
  const kids = await ensemblesOf(s, parent)
  const out: Array<{ id: number; jobId: string | null; was: string }> = []
  const { SamplingRun } = samplingModels(s.sequelize, s.models)
  for (const k of kids) {
    if (SAMPLING_DONE_STATES.includes(k.state)) continue
    const [n] = await SamplingRun.update({ state: 'cancelled', finishedAt: new Date(), error: `Cancelled by ${actorName} (with its parallel run ${parent.id}).` }, { where: { id: k.id, state: ['queued', 'running'] } })
    if (n) out.push({ id: k.id, jobId: k.jobId, was: k.state })
  }
  return out
}
