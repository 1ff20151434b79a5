/**
 * `npm run compile:wasm`: compiles the WebAssembly WBGT kernel from its AssemblyScript source
 * (pipeline/physics/wasm/wbgt-pairs.ts) with the pinned AssemblyScript compiler (a development
 * dependency) and writes the binary, base64-encoded, into pipeline/physics/wbgt-wasm-binary.ts.
 * The binary is committed, so installing and running heathours needs no WebAssembly compiler;
 * test/physics/wasm-binary.test.ts compiles the source again and checks the committed binary is
 * exactly what it gives. Run it after changing the source.
 *
 * `--check` compiles and compares without writing (exit 1 when the committed binary differs).
 */
import { readFileSync, writeFileSync } from 'node:fs';
import { packagePath } from '../pipeline/model/package-root.ts';

export const WASM_SOURCE = 'pipeline/physics/wasm/wbgt-pairs.ts';
export const WASM_MODULE = 'pipeline/physics/wbgt-wasm-binary.ts';

/** The compiler's options: optimised, SIMD, no runtime (the kernel allocates nothing), no assertions. */
const ASC_OPTIONS = ['-O3', '--runtime', 'stub', '--enable', 'simd', '--noAssert', '--initialMemory', '8'];

/** Compiles the kernel's source; returns the WebAssembly binary. */
export async function compileWasmKernel(): Promise<Uint8Array> {
  const asc = (await import('assemblyscript/asc')).default;
  let binary: Uint8Array | undefined;
  let messages = '';
  const { error } = await asc.main([packagePath(WASM_SOURCE), ...ASC_OPTIONS, '--outFile', 'kernel.wasm'], {
    writeFile: (name: string, contents: Uint8Array | string) => {
      if (name.endsWith('kernel.wasm') && typeof contents !== 'string') binary = contents;
    },
    stdout: {
      write: (s: string) => {
        messages += s;
        return true;
      },
    } as never,
    stderr: {
      write: (s: string) => {
        messages += s;
        return true;
      },
    } as never,
  });
  if (error || binary === undefined) throw new Error(`AssemblyScript could not compile ${WASM_SOURCE}: ${error?.message ?? 'no binary written'}\n${messages}`);
  return binary;
}

/** The TypeScript module holding the binary (base64, 100 characters a line). */
export function binaryModule(binary: Uint8Array): string {
  const b64 = Buffer.from(binary).toString('base64');
  const lines: string[] = [];
  for (let i = 0; i < b64.length; i += 100) lines.push(`  '${b64.slice(i, i + 100)}'`);
  return `/**
 * The WebAssembly WBGT kernel (${binary.length} bytes), compiled from ${WASM_SOURCE} by
 * \`npm run compile:wasm\` (scripts/compile-wasm.ts). Generated: do not edit. Held as base64 so the
 * physics stage loads it without reading a file; test/physics/wasm-binary.test.ts checks it is
 * what the source compiles to.
 */
export const WBGT_WASM_BASE64 =
${lines.join(' +\n')};
`;
}

/** The committed module's binary. */
export function committedBinary(): Uint8Array {
  const text = readFileSync(packagePath(WASM_MODULE), 'utf8');
  const b64 = [...text.matchAll(/^ {2}'([A-Za-z0-9+/=]*)'/gm)].map((m) => m[1]).join('');
  return new Uint8Array(Buffer.from(b64, 'base64'));
}

if (process.argv[1] && import.meta.url.endsWith(process.argv[1].split('/').pop()!)) {
  const binary = await compileWasmKernel();
  if (process.argv.includes('--check')) {
    const same = Buffer.from(binary).equals(Buffer.from(committedBinary()));
    process.stdout.write(same ? `${WASM_MODULE} is up to date\n` : `${WASM_MODULE} differs from what ${WASM_SOURCE} compiles to: run npm run compile:wasm\n`);
    process.exit(same ? 0 : 1);
  }
  writeFileSync(packagePath(WASM_MODULE), binaryModule(binary));
  process.stdout.write(`heathours: compiled ${WASM_SOURCE} into ${WASM_MODULE} (${binary.length} bytes of WebAssembly)\n`);
}
