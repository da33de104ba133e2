import { describe, it, expect } from 'vitest'
import { readFileSync } from 'node:fs'
import { compileDenseWasm, denseWasmModuleText, DENSE_WASM_MODULE } from '../../../../scripts/build-wasm.ts'
import { DENSE_CHOLESKY_WASM } from '../../../../shared/rv/gp/dense-wasm-binary.ts'

describe('the committed WebAssembly Cholesky kernel', () => {
  it('is what wasm/dense-cholesky.ts compiles to today (run `npm run build:wasm` after editing it)', async () => {
    const fresh = await compileDenseWasm()
    expect(readFileSync(DENSE_WASM_MODULE, 'utf8')).toBe(denseWasmModuleText(fresh))
    expect(Buffer.from(DENSE_CHOLESKY_WASM, 'base64').equals(Buffer.from(fresh))).toBe(true)
  })

  it('stays under 4 kB, the size browsers compile synchronously on the main thread', () => {
    expect(Buffer.from(DENSE_CHOLESKY_WASM, 'base64').length).toBeLessThan(4096)
  })
})
