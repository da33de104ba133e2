// npm start must not go down silently when the API dies (issue 11): scripts/supervise.sh restarts
// the process with a message, gives up with status 1 and a message when it keeps dying, and passes
// Ctrl-C/SIGTERM on to the process.
import { spawn } from 'node:child_process'
import { mkdtempSync, readFileSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { describe, expect, it } from 'vitest'

const SCRIPT = join(import.meta.dirname, '../../scripts/supervise.sh')

function run(args: string[], onStart?: (pid: number) => void): Promise<{ code: number | null; stderr: string }> {
  return new Promise((resolve, reject) => {
    const p = spawn('bash', [SCRIPT, ...args], { stdio: ['ignore', 'ignore', 'pipe'] })
    let stderr = ''
    p.stderr.on('data', (d) => { stderr += String(d) })
    p.on('error', reject)
    p.on('exit', (code) => resolve({ code, stderr }))
    onStart?.(p.pid!)
  })
}

describe('scripts/supervise.sh', () => {
  it('restarts a process that dies, then gives up with status 1 and says why', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'supervise-'))
    try {
      const log = join(dir, 'runs')
      const { code, stderr } = await run(['API', '1', '60', '--', 'bash', '-c', `echo run >> ${log}; exit 3`])
      expect(readFileSync(log, 'utf8').trim().split('\n')).toHaveLength(2) // first run + one restart
      expect(stderr).toMatch(/the API stopped unexpectedly \(status 3\); restarting it/)
      expect(stderr).toMatch(/the API exited 2 times within 60 s \(last status 3\); not restarting it again/)
      expect(code).toBe(1)
    } finally { rmSync(dir, { recursive: true, force: true }) }
  }, 30_000)

  it('passes SIGTERM to the process and exits 0 without restarting it', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'supervise-'))
    try {
      const log = join(dir, 'runs')
      const result = await run(['API', '5', '60', '--', 'bash', '-c', `echo run >> ${log}; trap 'echo term >> ${log}; exit 0' TERM; sleep 30 & wait`], (pid) => {
        const poll = setInterval(() => {
          try { if (readFileSync(log, 'utf8').includes('run')) { clearInterval(poll); process.kill(pid, 'SIGTERM') } } catch { /* not started yet */ }
        }, 50)
      })
      expect(result.code).toBe(0)
      expect(readFileSync(log, 'utf8').trim().split('\n')).toEqual(['run', 'term'])
      expect(result.stderr).not.toMatch(/restarting/)
    } finally { rmSync(dir, { recursive: true, force: true }) }
  }, 30_000)
})
