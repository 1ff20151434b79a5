/**
 * The committed WebAssembly binary (pipeline/physics/wbgt-wasm-binary.ts) is what its
 * AssemblyScript source (pipeline/physics/wasm/wbgt-pairs.ts) compiles to with the pinned
 * compiler and the options of scripts/compile-wasm.ts: a change to the source without
 * `npm run compile:wasm` fails here, so the kernel the tests run is the kernel the source says.
 */
import { describe, it, expect } from 'vitest';
import { compileWasmKernel, committedBinary, binaryModule, WASM_MODULE } from '../../scripts/compile-wasm.ts';
import { readFileSync } from 'node:fs';
import { packagePath } from '../../pipeline/model/package-root.ts';

describe('the committed WebAssembly kernel', () => {
  it('is byte for byte what the AssemblyScript source compiles to, and the module file is exactly what compile:wasm writes', async () => {
    const fresh = await compileWasmKernel();
    const committed = committedBinary();
    expect(committed.length).toBeGreaterThan(1000);
    expect(Buffer.from(fresh).equals(Buffer.from(committed))).toBe(true);
    expect(readFileSync(packagePath(WASM_MODULE), 'utf8')).toBe(binaryModule(fresh));
    // A WebAssembly module (magic and version 1) that this runtime validates.
    expect([...committed.subarray(0, 8)]).toEqual([0x00, 0x61, 0x73, 0x6d, 0x01, 0x00, 0x00, 0x00]);
    expect(WebAssembly.validate(new Uint8Array(committed))).toBe(true);
  }, 300_000);
});
