// The next-observation planner: recommended instants for a star from a finished sampling run.
import { request } from './http.ts'
import type { PlanRequest, PlanResponse } from '@shared/api/plan.ts'

export const requestPlan = (starId: number, body: PlanRequest) => request<PlanResponse>(`/stars/${starId}/plan`, { method: 'POST', body })
