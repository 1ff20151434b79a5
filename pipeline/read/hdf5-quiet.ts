/**
 * Runs h5wasm calls without letting the HDF5 library print to the terminal. HDF5 reports a
 * failure by printing its error stack ("HDF5-DIAG: Error detected in HDF5 …", "major: …",
 * "minor: …") to standard error; compiled to WebAssembly with Node's raw file system (h5wasm's
 * NODERAWFS build), that text goes straight to file descriptor 2 through `fs.writeSync`, and
 * an abort message through `console.error`. While `fn` runs (h5wasm calls are synchronous) both
 * are captured instead, and the text is handed to the caller, which keeps it as the details of
 * the catalogued error it throws (shown with `--verbose`).
 */
import fs from 'node:fs';

/** Runs `fn`; returns its value or throws its error, with what HDF5 printed meanwhile. */
export function quietly<T>(fn: () => T): { value?: T; error?: unknown; printed: string } {
  let printed = '';
  const writeSync = fs.writeSync;
  const consoleError = console.error;
  fs.writeSync = ((fd: number, buffer: string | NodeJS.ArrayBufferView, ...rest: unknown[]) => {
    if (fd !== 1 && fd !== 2) return (writeSync as (...a: unknown[]) => number)(fd, buffer, ...rest);
    if (typeof buffer === 'string') {
      printed += buffer;
      return Buffer.byteLength(buffer);
    }
    const [offset = 0, length = buffer.byteLength - offset] = rest as [number | undefined, number | undefined];
    printed += Buffer.from(buffer.buffer, buffer.byteOffset + offset, length).toString('utf8');
    return length;
  }) as typeof fs.writeSync;
  console.error = (...args: unknown[]) => {
    printed += `${args.map(String).join(' ')}\n`;
  };
  // Emscripten bound console.error when the module loaded; that copy writes through process.stderr.
  const stderrWrite = process.stderr.write;
  process.stderr.write = ((chunk: string | Uint8Array, ...rest: unknown[]) => {
    printed += typeof chunk === 'string' ? chunk : Buffer.from(chunk).toString('utf8');
    (rest.find((x) => typeof x === 'function') as (() => void) | undefined)?.();
    return true;
  }) as typeof process.stderr.write;
  try {
    return { value: fn(), printed };
  } catch (error) {
    return { error, printed };
  } finally {
    fs.writeSync = writeSync;
    console.error = consoleError;
    process.stderr.write = stderrWrite;
  }
}

/** Whether an error from h5wasm means the WebAssembly instance stopped (Emscripten `abort()`). */
export function isAbort(e: unknown): boolean {
  const m = (e as Error)?.message ?? String(e);
  return /Aborted\(|program has already aborted|RuntimeError: (unreachable|memory access out of bounds)/.test(m) || e instanceof WebAssembly.RuntimeError;
}

/** A short text for an h5wasm error: its message, or HDF5's own last "minor:" line. */
export function hdf5Reason(e: unknown, printed: string): string {
  const msg = ((e as Error)?.message ?? String(e)).trim();
  const minors = [...printed.matchAll(/minor: (.+)/g)].map((m) => m[1].trim());
  const lasts = [...printed.matchAll(/ in (H5\w+)\(\): (.+)/g)].map((m) => m[2].trim());
  const hdf5 = lasts.length > 0 ? `${lasts[lasts.length - 1]}${minors.length > 0 ? ` (${minors[minors.length - 1]})` : ''}` : '';
  if (/name not defined|^error/.test(msg) && hdf5) return `the HDF5 library says: ${hdf5}`;
  return hdf5 ? `${msg}; the HDF5 library says: ${hdf5}` : msg;
}
