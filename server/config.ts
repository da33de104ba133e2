import { z } from 'zod'

/** Environment, parsed once and typed. Development defaults apply outside production only. */
const envSchema = z.object({
  NODE_ENV: z.enum(['development', 'test', 'production']).default('development'),
  DATABASE_URL: z.string().min(1).default('postgres://postgres@127.0.0.1:54329/starsway'),
  PORT: z.coerce.number().int().min(0).max(65535).default(3000),
  HOST: z.string().default('127.0.0.1'),
  APP_URL: z.string().optional(),
  JWT_SECRET: z.string().min(16, 'JWT_SECRET must be at least 16 characters').optional(),
  SMTP_HOST: z.string().default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  SMTP_FROM: z.string().default('Starsway <no-reply@starsway.test>'),
  MAIL_DIR: z.string().default('.data/mail'),
  BCRYPT_COST: z.coerce.number().int().min(4).max(15).default(10),
  UPLOAD_MAX_BYTES: z.coerce.number().int().positive().default(20 * 1024 * 1024),
  UPLOAD_MAX_ROWS: z.coerce.number().int().positive().default(200_000),
  LOGIN_RATE_LIMIT: z.coerce.number().int().positive().default(10),
  SHARE_RATE_LIMIT: z.coerce.number().int().positive().default(20),
  JOB_WORKERS: z.enum(['0', '1', 'true', 'false']).default('1'),
  JOB_CONCURRENCY: z.coerce.number().int().min(1).max(64).default(1),
  JOB_STALE_SECONDS: z.coerce.number().positive().default(30),
  JOB_RETRY_LIMIT: z.coerce.number().int().min(0).max(100).default(5),
  SAMPLING_CHECKPOINT_STEPS: z.coerce.number().int().positive().default(250),
  SAMPLING_CHECKPOINT_MIN_SECONDS: z.coerce.number().min(0).default(10),
  PERIODOGRAM_TEAM_BYTES: z.coerce.number().int().min(0).default(128 * 1024 * 1024),
})

export interface Config {
  env: 'development' | 'test' | 'production'
  databaseUrl: string
  port: number
  host: string
  appUrl: string
  jwtSecret: string
  smtp: { host: string; port: number; user?: string; pass?: string; from: string }
  mailDir: string
  bcryptCost: number
  upload: { maxBytes: number; maxRows: number; maxFiles: number }
  /** Failed sign-ins (and reset requests) allowed per 15 minutes per IP + e-mail. */
  loginRateLimit: number
  /** Report share messages one user may send per hour. */
  shareRateLimit: number
  /** Development-only routes (/api/dev/mail, /dev/mail). */
  devRoutes: boolean
  /** Bound on the bytes of full periodogram curves one team keeps (server/analyses/periodogram-store.ts). */
  periodogramTeamBytes: number
  /** Job queue (server/jobs): whether this server process also works on jobs, and how. */
  jobs: {
    workers: boolean; concurrency: number; staleSeconds: number; retryLimit: number
    checkpointEvery: number; checkpointMinMs: number; pollingIntervalSeconds: number
  }
}

const DEV_SECRET = 'starsway-development-secret-not-for-production'

/**
 * Why a production JWT secret is too weak, or null. At least 32 characters (256 bits for
 * HS256, RFC 7518 §3.2 asks for a key of at least the hash size) with at least 10 distinct
 * characters, and never the published development one.
 */
export function weakSecretReason(secret: string): string | null {
  if (secret === DEV_SECRET || secret.includes('starsway-development')) return 'is the published development secret'
  if (secret.length < 32) return `has ${secret.length} characters; use at least 32`
  if (new Set(secret).size < 10) return 'repeats too few characters'
  return null
}

export function loadConfig(env: NodeJS.ProcessEnv = process.env, overrides: Partial<Config> = {}): Config {
  const parsed = envSchema.safeParse(env)
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!
    throw new Error(`Invalid environment: ${issue.path.join('.')}: ${issue.message}`)
  }
  const e = parsed.data
  if (e.NODE_ENV === 'production' && !e.JWT_SECRET) throw new Error('JWT_SECRET must be set in production')
  const weak = e.NODE_ENV === 'production' && e.JWT_SECRET ? weakSecretReason(e.JWT_SECRET) : null
  if (weak) throw new Error(`JWT_SECRET ${weak}: generate one with \`openssl rand -base64 48\``)
  const config: Config = {
    env: e.NODE_ENV,
    databaseUrl: e.DATABASE_URL,
    port: e.PORT,
    host: e.HOST,
    appUrl: (e.APP_URL ?? `http://${e.HOST}:${e.PORT}`).replace(/\/$/, ''),
    jwtSecret: e.JWT_SECRET ?? DEV_SECRET,
    smtp: { host: e.SMTP_HOST, port: e.SMTP_PORT, user: e.SMTP_USER, pass: e.SMTP_PASS, from: e.SMTP_FROM },
    mailDir: e.MAIL_DIR,
    bcryptCost: e.BCRYPT_COST,
    upload: { maxBytes: e.UPLOAD_MAX_BYTES, maxRows: e.UPLOAD_MAX_ROWS, maxFiles: 10 },
    loginRateLimit: e.LOGIN_RATE_LIMIT,
    shareRateLimit: e.SHARE_RATE_LIMIT,
    devRoutes: e.NODE_ENV !== 'production',
    periodogramTeamBytes: e.PERIODOGRAM_TEAM_BYTES,
    jobs: {
      workers: e.JOB_WORKERS === '1' || e.JOB_WORKERS === 'true', concurrency: e.JOB_CONCURRENCY, staleSeconds: e.JOB_STALE_SECONDS,
      retryLimit: e.JOB_RETRY_LIMIT, checkpointEvery: e.SAMPLING_CHECKPOINT_STEPS, checkpointMinMs: e.SAMPLING_CHECKPOINT_MIN_SECONDS * 1000, pollingIntervalSeconds: 2,
    },
  }
  return { ...config, ...overrides }
}
