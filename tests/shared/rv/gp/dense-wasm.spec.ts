import { describe, it, expect } from 'vitest'
import { readFileSync } from 'node:fs'
import { compileWasm, wasmModuleText, fromRoot, WASM_KERNELS } from '../../../../scripts/build-wasm.ts'

describe.each(WASM_KERNELS.map((k) => [k.name, k] as const))('the committed WebAssembly kernel %s', (_, kernel) => {
  it('is what its source compiles to today (run `npm run build:wasm` after editing it)', async () => {
    const fresh = await compileWasm(kernel)
    expect(readFileSync(fromRoot(kernel.module), 'utf8')).toBe(wasmModuleText(kernel, fresh))
    const committed = (await import(fromRoot(kernel.module)) as Record<string, string>)[kernel.constant]
    expect(Buffer.from(committed, 'base64').equals(Buffer.from(fresh))).toBe(true)
  }, 60_000)

  it('stays under 4 kB, the size browsers compile synchronously on the main thread', async () => {
    const committed = (await import(fromRoot(kernel.module)) as Record<string, string>)[kernel.constant]
    expect(Buffer.from(committed, 'base64').length).toBeLessThan(4096)
  })
})
