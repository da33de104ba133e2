/**
 * Synchronous loading of the project's WebAssembly kernels (wasm/*.ts, compiled by `npm run build:wasm`
 * into base64 modules), the same way in Node, workers and the browser: no file to fetch, no loader.
 * Each module is under 4 kB, the size browsers compile synchronously on the main thread. Where
 * WebAssembly or its SIMD is missing or refused (e.g. a Content-Security-Policy without
 * 'wasm-unsafe-eval'), the loader answers null and the caller keeps its TypeScript path.
 */

/** The part of the WebAssembly API the kernels use (declared here: the server's type libraries lack it). */
export interface WasmMemory { buffer: ArrayBuffer; grow(pages: number): number }
export interface WasmApi {
  Module: new (bytes: Uint8Array) => object
  Instance: new (module: object, imports: object) => { exports: unknown }
}
export interface CompiledWasm { api: WasmApi; module: object }

/** A loader for one base64 module: compiles it on first call and remembers the result (or null). */
export function wasmModuleLoader(base64: string): () => CompiledWasm | null {
  let loaded: CompiledWasm | null | undefined
  return () => {
    if (loaded !== undefined) return loaded
    loaded = null
    try {
      const api = (globalThis as { WebAssembly?: WasmApi }).WebAssembly
      if (!api || typeof atob !== 'function') return null
      const s = atob(base64)
      const bytes = new Uint8Array(s.length)
      for (let i = 0; i < s.length; i++) bytes[i] = s.charCodeAt(i)
      loaded = { api, module: new api.Module(bytes) }
    } catch {
      loaded = null // no SIMD, or compilation refused
    }
    return loaded
  }
}
