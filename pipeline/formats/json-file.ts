/**
 * A JSON file written piece by piece: the bytes of `JSON.stringify(value, null, indent)`, without
 * building the whole text as one string. The manifest of an atlas of 10,000 regions lists ~42,000
 * files (~45 MB of JSON); as one string it would grow with the regions until it met V8's limit on
 * a string's length (~512 M characters), an internal error on a large atlas. Here the top of the
 * value (objects and arrays down to {@link EXPANDED_DEPTH}) and every long array are written
 * element by element, and each element as its own small string.
 */
import { createWriteStream } from 'node:fs';
import { once } from 'node:events';
import { rename, rm } from 'node:fs/promises';

/** Objects and arrays above this depth are written member by member [levels]. */
const EXPANDED_DEPTH = 2;
/** Arrays longer than this are written element by element at any depth [elements]. */
const LONG_ARRAY = 256;
/** Text gathered before it is handed to the file [characters]. */
const FLUSH_AT = 1 << 16;

/** Whether `JSON.stringify` leaves out an object member of this value (and writes `null` for it in an array). */
function unserialisable(v: unknown): boolean {
  return v === undefined || typeof v === 'function' || typeof v === 'symbol';
}

function isPlainObject(v: unknown): v is Record<string, unknown> {
  if (v === null || typeof v !== 'object' || Array.isArray(v)) return false;
  if (typeof (v as { toJSON?: unknown }).toJSON === 'function') return false;
  const proto = Object.getPrototypeOf(v);
  return proto === Object.prototype || proto === null;
}

/**
 * The text of `value` as `JSON.stringify(value, null, indent)` gives it, in pieces handed to `put`
 * in order (each piece at most one element's text, or one short run of punctuation).
 */
export function* jsonPieces(value: unknown, indent: number): Generator<string> {
  yield* piecesOf(value, 0, indent);
}

function* piecesOf(v: unknown, depth: number, indent: number): Generator<string> {
  const here = ' '.repeat(indent * depth);
  const inner = ' '.repeat(indent * (depth + 1));
  // What JSON.stringify puts before a member and after a key: a new line and the indent, ": "; without an indent nothing, ":".
  const open = indent > 0 ? `\n${inner}` : '';
  const close = indent > 0 ? `\n${here}` : '';
  const colon = indent > 0 ? ': ' : ':';
  if (Array.isArray(v) && v.length > 0 && (depth < EXPANDED_DEPTH || v.length > LONG_ARRAY)) {
    yield '[';
    for (let i = 0; i < v.length; i++) {
      yield `${i > 0 ? ',' : ''}${open}`;
      if (unserialisable(v[i])) yield 'null';
      else yield* piecesOf(v[i], depth + 1, indent);
    }
    yield `${close}]`;
    return;
  }
  if (isPlainObject(v) && depth < EXPANDED_DEPTH) {
    const keys = Object.keys(v).filter((k) => !unserialisable(v[k]));
    if (keys.length === 0) {
      yield '{}';
      return;
    }
    yield '{';
    for (let i = 0; i < keys.length; i++) {
      yield `${i > 0 ? ',' : ''}${open}${JSON.stringify(keys[i])}${colon}`;
      yield* piecesOf(v[keys[i]], depth + 1, indent);
    }
    yield `${close}}`;
    return;
  }
  // A small value: one string, its lines moved to this depth.
  const text = JSON.stringify(v, null, indent) as string | undefined;
  if (text === undefined) throw new TypeError(`${String(v)} has no JSON text`);
  yield depth > 0 && text.includes('\n') ? text.replaceAll('\n', `\n${here}`) : text;
}

/**
 * Writes `JSON.stringify(value, null, indent)` into `path`, in pieces (see the file comment),
 * through `<path>.part` renamed at the end: a value that cannot be written (a BigInt, a cycle)
 * leaves neither the file nor the part.
 */
export async function writeJsonFile(path: string, value: unknown, indent = 1): Promise<void> {
  const part = `${path}.part`;
  const out = createWriteStream(part);
  const failed = new Promise<never>((_, reject) => out.once('error', reject));
  failed.catch(() => undefined);
  try {
    let pending = '';
    const flush = async () => {
      if (pending === '') return;
      const ok = out.write(pending);
      pending = '';
      if (!ok) await Promise.race([once(out, 'drain'), failed]);
    };
    for (const piece of jsonPieces(value, indent)) {
      pending += piece;
      if (pending.length >= FLUSH_AT) await flush();
    }
    await flush();
    out.end();
    await Promise.race([once(out, 'finish'), failed]);
    await rename(part, path);
  } catch (e) {
    // The stream opens its file asynchronously: wait until it is closed, or the part could be
    // created after it was removed (a value that fails at once, on a loaded machine).
    out.destroy();
    if (!out.closed) await once(out, 'close').catch(() => undefined);
    await rm(part, { force: true });
    throw e;
  }
}
