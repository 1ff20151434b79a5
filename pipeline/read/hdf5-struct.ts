/**
 * The low-level pieces every JavaScript reader of HDF5 structures here shares (HDF5 File Format
 * Specification version 3.0, The HDF Group): the format signature (§II.A "Format Signature"),
 * little-endian numbers and addresses (§I "Introduction": the undefined address has all bits set),
 * the superblock, versions 0–3 (§II.A "Superblock"), and the refusal a reader throws when a
 * structure is not one it understands or does not hold together: the caller then leaves the file
 * (or the variable) to the HDF5 library.
 */
import { lookup3 } from './hdf5-checksum.ts';

/** The 8 bytes an HDF5 file starts with: \x89 H D F \r \n \x1a \n (§II.A "Format Signature"). */
export const HDF5_SIGNATURE: readonly number[] = [0x89, 0x48, 0x44, 0x46, 0x0d, 0x0a, 0x1a, 0x0a];

/** Whether `head` starts with the HDF5 format signature. */
export function hasHdf5Signature(head: Uint8Array): boolean {
  return head.length >= 8 && HDF5_SIGNATURE.every((b, i) => head[i] === b);
}

/** Why a structure is not read in JavaScript (the caller falls back to the HDF5 library). */
export class RawLayoutRefused extends Error {}

/** Throws {@link RawLayoutRefused} with the reason. */
export const refuse = (why: string): never => {
  throw new RawLayoutRefused(why);
};

/** An unsigned little-endian number of `n` bytes at `at`; refused past the end of `b`. */
export function le(b: Uint8Array, at: number, n: number): number {
  if (at < 0 || at + n > b.length) refuse(`structure cut short (wanted ${n} bytes at ${at} of ${b.length})`);
  let x = 0;
  for (let i = n - 1; i >= 0; i--) x = x * 256 + b[at + i];
  return x;
}

/** An address field [bytes], or -1 for the undefined address (all bits set, §I). */
export function addr(b: Uint8Array, at: number, n: number): number {
  let all = true;
  for (let i = 0; i < n; i++) if (b[at + i] !== 0xff) all = false;
  if (all && at + n <= b.length) return -1;
  const x = le(b, at, n);
  if (!Number.isSafeInteger(x)) refuse('an address beyond 2^53 bytes');
  return x;
}

/** Sizes of file addresses and lengths, and the base all addresses are relative to [bytes]. */
export interface Hdf5Sizes {
  offsets: number;
  lengths: number;
  base: number;
}

/** What the superblock says (§II.A, versions 0–3). */
export interface Hdf5Superblock extends Hdf5Sizes {
  version: number;
  /** Address of the root group's object header [bytes]. */
  root: number;
  /** End-of-file address [bytes]. */
  eof: number;
}

/** Bytes the superblock may take: version 0/1 with 8-byte offsets and the root symbol table entry [bytes]. */
export const SUPERBLOCK_BYTES = 128;

/**
 * Reads the superblock at byte 0 (§II.A): versions 0 and 1 (root group as a symbol table entry,
 * §III.C) and versions 2 and 3 (root object header address; the Jenkins lookup3 checksum is
 * verified). A user block (base address other than 0) is refused.
 */
export function readSuperblock(head: Uint8Array): Hdf5Superblock {
  if (!hasHdf5Signature(head)) refuse('no HDF5 superblock at byte 0');
  const f = superblockFields(head);
  if (typeof f === 'string') return refuse(f);
  const { version, offsets, lengths, baseAt } = f;
  const base = addr(head, baseAt, offsets);
  if (base !== 0) refuse(`base address ${base} (a user block)`);
  let root: number;
  let eof: number;
  if (version <= 1) {
    // base, free-space info, end of file, driver info; then the root group's symbol table entry
    // (link name offset, object header address, ...).
    eof = addr(head, baseAt + 2 * offsets, offsets);
    root = addr(head, baseAt + 4 * offsets + offsets, offsets);
  } else {
    // base, superblock extension, end of file, root object header; then the checksum.
    eof = addr(head, baseAt + 2 * offsets, offsets);
    root = addr(head, baseAt + 3 * offsets, offsets);
    const sumAt = baseAt + 4 * offsets;
    const stored = le(head, sumAt, 4);
    if (lookup3(head.subarray(0, sumAt)) !== stored) refuse('the superblock checksum does not match');
  }
  if (root < 0) refuse('no root group address');
  return { version, offsets, lengths, base, root, eof };
}

/**
 * Where the superblock's fields lie (§II.A): its version, sizes of offsets and lengths [bytes]
 * and the byte where the base address starts (the end-of-file address follows two addresses
 * later in every version), or what is wrong.
 */
function superblockFields(head: Uint8Array): { version: number; offsets: number; lengths: number; baseAt: number } | string {
  if (head.length < 16) return 'a superblock cut short';
  const version = head[8];
  let offsets: number;
  let lengths: number;
  let baseAt: number;
  if (version === 0 || version === 1) {
    offsets = head[13];
    lengths = head[14];
    baseAt = version === 0 ? 24 : 28;
  } else if (version === 2 || version === 3) {
    offsets = head[9];
    lengths = head[10];
    baseAt = 12;
  } else return `superblock version ${version}`;
  if ((offsets !== 4 && offsets !== 8) || (lengths !== 4 && lengths !== 8)) return `sizes of offsets ${offsets} and lengths ${lengths}`;
  return { version, offsets, lengths, baseAt };
}

/** The end-of-file address the superblock records [bytes] (§II.A, versions 0–3; the undefined address reads as 2^64 - 1), or null when it cannot be had. */
export function superblockEndOfFile(head: Uint8Array): number | null {
  const f = superblockFields(head);
  if (typeof f === 'string') return null;
  const at = f.baseAt + 2 * f.offsets;
  if (head.length < at + f.offsets) return null;
  // Beyond 2^53 the number is approximate, still far beyond any file (the caller compares sizes).
  return le(head, at, f.offsets);
}

/** Superblock fields the chunk reader needs (§II.A, versions 0–3, at offset 0). */
export function superblockSizes(head: Uint8Array): Hdf5Sizes {
  const { offsets, lengths, base } = readSuperblock(head);
  return { offsets, lengths, base };
}
