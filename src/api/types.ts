/**
 * Shapes of the API's request and response bodies, inferred from the zod schemas in `shared/api`
 * (the server validates with the same schemas, so the two sides cannot drift apart).
 */
export type { Role } from '@shared/api/common.ts'
export type { User, Membership, MeResponse as Me, RegisterRequest } from '@shared/api/auth.ts'
export type {
  TeamSummary, Member, TeamDetail, Invitation, PublicInvitation as InvitationInfo, AcceptInvitationResponse,
} from '@shared/api/teams.ts'
export type { StarSummary, Star, CreateStarRequest as StarInput, UpdateStarRequest } from '@shared/api/stars.ts'
export type { Measurement, DatasetUsage } from '@shared/api/measurements.ts'
export type {
  FilePreview, PreviewResponse, CommitResponse, CommitProblem, CommitOptions, OverlapReport, DatasetSummary as Dataset,
} from '@shared/api/uploads.ts'
export type {
  ColumnMapping, ColumnRole, DateSplit, Delimiter, DetectHints, Detection, ParsedRow, RowProblem,
  TableMapping, TimeFormat, TimeScale, Question, VelocityUnit,
} from '@shared/ingest/types.ts'
