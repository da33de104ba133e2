import type { Transaction } from 'sequelize'
import type { Services } from '../services.ts'
import type { AuditEntry as AuditEntryJson } from '../../shared/api/audit.ts'

export interface AuditRecord {
  teamId: number
  userId: number | null
  action: string
  entity: string
  entityId?: number | null
  detail?: Record<string, unknown>
}

/** Writes one audit entry, inside the caller's transaction when there is one. */
export async function record(s: Services, entry: AuditRecord, transaction?: Transaction): Promise<void> {
  await s.models.AuditEntry.create({
    teamId: entry.teamId, userId: entry.userId, action: entry.action, entity: entry.entity,
    entityId: entry.entityId ?? null, detail: entry.detail ?? {},
  }, { transaction })
}

/** The newest 200 entries of a team. */
export async function list(s: Services, teamId: number, limit = 200): Promise<AuditEntryJson[]> {
  const rows = await s.models.AuditEntry.findAll({
    where: { teamId }, order: [['at', 'DESC'], ['id', 'DESC']], limit,
    include: [{ model: s.models.User, as: 'user', attributes: ['id', 'name'] }],
  })
  return rows.map((r) => ({
    id: r.id, at: r.at.toISOString(), user: r.user ? { id: r.user.id, name: r.user.name } : null,
    action: r.action, entity: r.entity, entityId: r.entityId, detail: r.detail,
  }))
}
