// Password hashing thread (server/auth/hasher.ts): bcryptjs is pure JavaScript, ~100 ms a hash at
// cost 10, so it runs here instead of on the API's event loop. Plain JavaScript: starts without tsx.
import { parentPort } from 'node:worker_threads'
import bcrypt from 'bcryptjs'

parentPort.on('message', ({ id, op, password, hash, cost }) => {
  try {
    const out = op === 'hash' ? bcrypt.hashSync(password, cost) : bcrypt.compareSync(password, hash)
    parentPort.postMessage({ id, ok: true, out })
  } catch (err) {
    parentPort.postMessage({ id, ok: false, message: err instanceof Error ? err.message : String(err) })
  }
})
