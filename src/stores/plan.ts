import { defineStore } from 'pinia'
import { requestPlan } from '@/api/plan.ts'
import type { PlanRequest, PlanResponse } from '@shared/api/plan.ts'
import { asyncState, track } from './async-state.ts'

/** The planner's answer for one star (recomputed on request; nothing is stored on the server). */
export const usePlanStore = defineStore('plan', () => {
  const plan = asyncState<PlanResponse>()
  async function compute(starId: number, body: PlanRequest) {
    await track(plan, () => requestPlan(starId, body))
  }
  function clear() { plan.data = null; plan.error = null }
  return { plan, compute, clear }
})
