/**
 * The members of an HDF5 group, read in JavaScript (HDF5 File Format Specification version 3.0):
 * new-style groups keep their links as Link messages in the object header (§IV.A.2.g, "compact
 * storage"; a Link Info message, §IV.A.2.c, says whether creation order is tracked and indexed);
 * old-style groups keep a Symbol Table message (§IV.A.2.r) pointing at a version 1 B-tree of
 * group nodes (§III.A.1, node type 0) whose leaves are symbol table nodes "SNOD" (§III.B) of
 * symbol table entries (§III.C), their names in a local heap "HEAP" (§III.D). Groups with many
 * links keep them densely: Link messages in a fractal heap indexed by a version 2 B-tree
 * (hdf5-dense.ts).
 *
 * Members come back in the order the HDF5 library lists them (H5Literate2): by creation order when
 * the group indexes it, else by name (byte order, as strcmp). Every node is visited once (a cycle
 * is refused) and counts are checked against the bytes read before they are looped over.
 */
import { btree2Records, FractalHeap } from './hdf5-dense.ts';
import type { Message, ReadAt } from './hdf5-layout.ts';
import { MSG_LINK, MSG_LINK_INFO, MSG_SYMBOL_TABLE, parseLink, parseLinkInfo, parseSymbolTable, type HardLink } from './hdf5-messages.ts';
import { addr, le, refuse, type Hdf5Sizes } from './hdf5-struct.ts';

/** Most members one description lists across all groups (a bound on the work a damaged file can cause). */
export const MAX_MEMBERS = 100_000;

/** Shared across one file's walk: structures visited (cycles) and members listed so far. */
export interface WalkBudget {
  visited: Set<number>;
  members: number;
}

const byName = (a: HardLink, b: HardLink): number => Buffer.compare(Buffer.from(a.name, 'utf8'), Buffer.from(b.name, 'utf8'));

/** Whether an object header's messages make it a group (a Symbol Table or Link Info message, or links). */
export function isGroup(messages: Message[]): boolean {
  return messages.some((m) => m.type === MSG_SYMBOL_TABLE || m.type === MSG_LINK_INFO || m.type === MSG_LINK);
}

/** The hard links of a group whose object header holds `messages`, in the library's order. */
export async function groupMembers(read: ReadAt, messages: Message[], s: Hdf5Sizes, fileBytes: number, budget: WalkBudget): Promise<HardLink[]> {
  for (const m of messages)
    if ((m.type === MSG_SYMBOL_TABLE || m.type === MSG_LINK_INFO || m.type === MSG_LINK) && m.flags & 0x02) refuse('a shared group message');
  const stab = messages.find((m) => m.type === MSG_SYMBOL_TABLE);
  let links: HardLink[];
  let indexed = false;
  if (stab) {
    if (messages.some((m) => m.type === MSG_LINK)) refuse('a group with both a symbol table and link messages');
    const { btree, heap } = parseSymbolTable(stab.data, s);
    const names = await localHeap(read, heap, s, fileBytes);
    links = [];
    await groupBtree(read, btree, -1, s, fileBytes, names, links, budget);
  } else {
    const info = messages.find((m) => m.type === MSG_LINK_INFO);
    links = messages.filter((m) => m.type === MSG_LINK).map((m) => parseLink(m.data, s));
    if (info) {
      const li = parseLinkInfo(info.data, s);
      indexed = li.indexed;
      if (li.heap >= 0) {
        // Dense storage: the link messages are objects of a fractal heap, indexed by name
        // (version 2 B-tree record type 5: name hash, heap ID).
        if (links.length > 0) refuse('a group with both dense and compact links');
        if (budget.visited.has(li.heap)) refuse(`a link heap at byte ${li.heap} reached twice`);
        budget.visited.add(li.heap);
        const heap = await FractalHeap.open(read, li.heap, s, fileBytes);
        for (const r of await btree2Records(read, li.names, 5, s, fileBytes)) links.push(parseLink(await heap.object(r.subarray(4)), s));
      }
    }
    budget.members += links.length;
  }
  if (budget.members > MAX_MEMBERS) refuse(`more than ${MAX_MEMBERS} group members`);
  const seen = new Set<string>();
  for (const l of links) {
    if (seen.has(l.name)) refuse(`two links named ${l.name} in one group`);
    seen.add(l.name);
    if (l.address >= fileBytes) refuse(`link ${l.name} points beyond the end of the file`);
  }
  if (indexed) {
    if (links.some((l) => l.order === undefined)) refuse('a group indexing creation order whose links do not carry it');
    return [...links].sort((a, b) => (a.order as number) - (b.order as number));
  }
  return [...links].sort(byName);
}

/** Reads `n` bytes at `at`, refusing what runs past the end of the file. */
async function exact(read: ReadAt, at: number, n: number, fileBytes: number, what: string): Promise<Uint8Array> {
  if (at < 0 || n < 0 || at + n > fileBytes || n > 64 << 20) refuse(`${what} at byte ${at} runs past the end of the file`);
  const b = await read(at, n);
  if (b.length < n) refuse(`${what} at byte ${at} runs past the end of the file`);
  return b;
}

/** A local heap (§III.D): its data segment, where link names are NUL-terminated strings. */
async function localHeap(read: ReadAt, at: number, s: Hdf5Sizes, fileBytes: number): Promise<Uint8Array> {
  const head = await exact(read, at, 8 + 2 * s.lengths + s.offsets, fileBytes, 'local heap');
  if (!(head[0] === 0x48 && head[1] === 0x45 && head[2] === 0x41 && head[3] === 0x50)) refuse(`no local heap signature at byte ${at}`);
  if (head[4] !== 0) refuse(`local heap version ${head[4]}`);
  const size = le(head, 8, s.lengths);
  const dataAt = addr(head, 8 + 2 * s.lengths, s.offsets);
  return exact(read, dataAt, size, fileBytes, 'local heap data');
}

const utf8 = new TextDecoder('utf-8', { fatal: true });

/** The NUL-terminated name at `offset` of a local heap's data. */
function heapName(names: Uint8Array, offset: number): string {
  if (offset >= names.length) refuse(`a link name at offset ${offset} beyond its local heap`);
  const end = names.indexOf(0, offset);
  if (end < 0) refuse('a link name without its terminating NUL');
  if (end === offset) refuse('an empty link name');
  try {
    return utf8.decode(names.subarray(offset, end));
  } catch {
    return refuse('a link name that is not UTF-8');
  }
}

/** Visits a version 1 B-tree of group nodes (§III.A.1, node type 0), adding every symbol table node's entries. */
async function groupBtree(
  read: ReadAt,
  at: number,
  wantLevel: number,
  s: Hdf5Sizes,
  fileBytes: number,
  names: Uint8Array,
  out: HardLink[],
  budget: WalkBudget,
): Promise<void> {
  if (budget.visited.has(at)) refuse(`a group B-tree node at byte ${at} reached twice`);
  budget.visited.add(at);
  const O = s.offsets;
  const head = await exact(read, at, 8 + 2 * O, fileBytes, 'group B-tree node');
  if (!(head[0] === 0x54 && head[1] === 0x52 && head[2] === 0x45 && head[3] === 0x45)) refuse(`no B-tree node signature at byte ${at}`);
  if (head[4] !== 0) refuse(`B-tree node type ${head[4]} where group members are indexed`);
  const level = head[5];
  if (wantLevel >= 0 && level !== wantLevel) refuse(`group B-tree node at byte ${at} has level ${level}, ${wantLevel} expected`);
  const entries = le(head, 6, 2);
  // Keys are local heap offsets (size of lengths), interleaved with child addresses.
  const bodyBytes = (entries + 1) * s.lengths + entries * O;
  const body = await exact(read, at + 8 + 2 * O, bodyBytes, fileBytes, 'group B-tree node');
  for (let e = 0; e < entries; e++) {
    const child = addr(body, s.lengths + e * (s.lengths + O), O);
    if (child < 0 || child >= fileBytes) refuse(`group B-tree child address ${child} outside the file`);
    if (level > 0) await groupBtree(read, child, level - 1, s, fileBytes, names, out, budget);
    else await symbolNode(read, child, s, fileBytes, names, out, budget);
  }
}

/** A symbol table node "SNOD" (§III.B) of symbol table entries (§III.C). */
async function symbolNode(read: ReadAt, at: number, s: Hdf5Sizes, fileBytes: number, names: Uint8Array, out: HardLink[], budget: WalkBudget): Promise<void> {
  if (budget.visited.has(at)) refuse(`a symbol table node at byte ${at} reached twice`);
  budget.visited.add(at);
  const head = await exact(read, at, 8, fileBytes, 'symbol table node');
  if (!(head[0] === 0x53 && head[1] === 0x4e && head[2] === 0x4f && head[3] === 0x44)) refuse(`no symbol table node signature at byte ${at}`);
  if (head[4] !== 1) refuse(`symbol table node version ${head[4]}`);
  const count = le(head, 6, 2);
  const entryBytes = 2 * s.offsets + 24;
  budget.members += count;
  if (budget.members > MAX_MEMBERS) refuse(`more than ${MAX_MEMBERS} group members`);
  const body = await exact(read, at + 8, count * entryBytes, fileBytes, 'symbol table node');
  for (let i = 0; i < count; i++) {
    const p = i * entryBytes;
    const name = heapName(names, le(body, p, s.offsets));
    const address = addr(body, p + s.offsets, s.offsets);
    const cache = le(body, p + 2 * s.offsets, 4);
    if (cache === 2) refuse(`member ${name} is a soft link`);
    if (address < 0) refuse(`member ${name} without an address`);
    out.push({ name, address });
  }
}
