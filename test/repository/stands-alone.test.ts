/**
 * The repository stands alone: a clean clone anywhere has everything its code, tests and docs
 * refer to. Checked over every text file of the clone that we write (sources, tests, docs,
 * configuration; not node_modules, build output or the binary fixtures):
 * - no path to check material kept in a folder beside the repository, or at an absolute path
 *   of one machine's work folder;
 * - the methods document is `docs/methods.md`, and every `docs/methods.md §n` cited names a
 *   section it has;
 * - the document itself: sections and equations numbered in order, and it cites every entry of
 *   the bibliography (pipeline/model/sources.ts) and nothing else by id.
 * This file spells out the patterns it looks for, so it is left out of its own scan.
 */
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative, resolve } from 'node:path';
import { SOURCE_IDS } from '../../pipeline/model/sources.ts';

const ROOT = resolve(import.meta.dirname, '../..');
/** Folders of the repository we write, and the files at its top. */
const FOLDERS = ['.ci', 'bench', 'bin', 'content', 'docs', 'pipeline', 'public', 'scripts', 'src', 'test'];
const SELF = 'test/repository/stands-alone.test.ts';
const SKIP_DIRS = new Set(['node_modules', 'compiled', 'dist', 'test-artifacts', '.astro', '.git', '.heathours-cache', '.cache']);

function walk(dir: string, out: string[]): void {
  for (const e of readdirSync(dir, { withFileTypes: true })) {
    if (e.isDirectory()) {
      if (!SKIP_DIRS.has(e.name)) walk(join(dir, e.name), out);
    } else if (e.isFile()) out.push(join(dir, e.name));
  }
}

/** Text files of the repository (a file holding a NUL byte is binary and skipped). */
function textFiles(): Array<{ rel: string; text: string }> {
  const paths: string[] = [];
  for (const f of FOLDERS) if (statSync(join(ROOT, f), { throwIfNoEntry: false })?.isDirectory()) walk(join(ROOT, f), paths);
  for (const e of readdirSync(ROOT, { withFileTypes: true }))
    if (e.isFile() && e.name !== 'package-lock.json' && e.name !== '.git') paths.push(join(ROOT, e.name));
  const out: Array<{ rel: string; text: string }> = [];
  for (const p of paths) {
    const buf = readFileSync(p);
    if (buf.includes(0) || relative(ROOT, p) === SELF) continue;
    out.push({ rel: relative(ROOT, p), text: buf.toString('utf8') });
  }
  return out;
}

/** Every line of `files` matching `re`, as `file:line: text`. */
function offending(files: Array<{ rel: string; text: string }>, re: RegExp): string[] {
  const hits: string[] = [];
  for (const f of files) {
    f.text.split('\n').forEach((line, i) => {
      if (re.test(line)) hits.push(`${f.rel}:${i + 1}: ${line.trim().slice(0, 120)}`);
    });
  }
  return hits;
}

const FILES = textFiles();
const METHODS = readFileSync(join(ROOT, 'docs/methods.md'), 'utf8');

/** Section numbers of docs/methods.md (`## 6.` and `### 6.3` headings). */
function sections(doc: string): string[] {
  return [...doc.matchAll(/^#{2,3} (\d+(?:\.\d+)?)\.? /gm)].map((m) => m[1]);
}

describe('the repository stands alone', () => {
  it('reads a few hundred of its own text files: sources, tests, documents and configuration', () => {
    expect(FILES.length).toBeGreaterThan(300);
    const rels = FILES.map((f) => f.rel);
    for (const f of [
      'README.md',
      'DEVELOPERS.md',
      'docs/methods.md',
      'pipeline/physics/kernel.ts',
      'src/pages/methods/index.astro',
      'test/helpers/fixtures.ts',
      '.ci/run',
    ])
      expect(rels).toContain(f);
  });

  it('no test, source or document refers to check material beside the repository (../shared) or to an absolute /work path', () => {
    expect(offending(FILES, /\.\.\/shared/)).toEqual([]);
    expect(offending(FILES, /(^|[^\w.~/-])\/work\//)).toEqual([]);
  });

  it('every mention of a methods document is docs/methods.md, the one in the repository', () => {
    const hits: string[] = [];
    for (const f of FILES) {
      f.text.split('\n').forEach((line, i) => {
        for (const m of line.matchAll(/methods\.md/gi))
          if (line.slice(Math.max(0, m.index - 5), m.index + 10) !== 'docs/methods.md') hits.push(`${f.rel}:${i + 1}: ${line.trim().slice(0, 120)}`);
      });
    }
    expect(hits).toEqual([]);
  });

  it('every docs/methods.md §n cited in the code, tests and docs is a section of the document (over a hundred citations)', () => {
    const have = new Set(sections(METHODS));
    const missing: string[] = [];
    let cited = 0;
    for (const f of FILES) {
      for (const m of f.text.matchAll(/docs\/methods\.md((?:\s*(?:§\d+(?:\.\d+)*|[–,-]|and)\s*)+)/g)) {
        for (const n of m[1].matchAll(/§(\d+(?:\.\d+)*)/g)) {
          cited++;
          if (!have.has(n[1])) missing.push(`${f.rel}: §${n[1]}`);
        }
      }
    }
    expect(missing).toEqual([]);
    expect(cited).toBeGreaterThan(100);
  });
});

describe('the methods document, docs/methods.md', () => {
  it('numbers its sections in order: 1, 2, … and 6.1, 6.2, … within each', () => {
    let top = 0;
    let sub = 0;
    for (const s of sections(METHODS)) {
      const [a, b] = s.split('.').map(Number);
      if (b === undefined) {
        expect(a, `§${s}`).toBe(top + 1);
        top = a;
        sub = 0;
      } else {
        expect([a, b], `§${s}`).toEqual([top, sub + 1]);
        sub = b;
      }
    }
    expect(top).toBeGreaterThanOrEqual(14);
  });

  it('numbers each equation by its section, in order, once: (6.1), (6.2), … defined in section 6', () => {
    let top = 0;
    let last = 0;
    let count = 0;
    for (const line of METHODS.split('\n')) {
      const h = line.match(/^## (\d+)\. /);
      if (h) {
        top = Number(h[1]);
        last = 0;
      }
      const e = line.match(/^- \((\d+)\.(\d+)\) /);
      if (e) {
        expect([Number(e[1]), Number(e[2])], line.slice(0, 60)).toEqual([top, last + 1]);
        last = Number(e[2]);
        count++;
      }
    }
    expect(count).toBeGreaterThan(60);
  });

  it('never starts a wrapped line with a Markdown list marker (the rendered page would break the equation into a new list)', () => {
    expect(METHODS.split('\n').filter((l) => /^\s+[-+*] /.test(l))).toEqual([]);
  });

  it('cites every entry of the bibliography (pipeline/model/sources.ts) by its id, and no id that is not in it', () => {
    // An id holds a digit or a hyphen; of such words in brackets only the unit [crew-hours] is not one.
    const cited = new Set([...METHODS.matchAll(/\[([a-z][a-z0-9-]*)\]/g)].map((m) => m[1]).filter((id) => /[\d-]/.test(id) && id !== 'crew-hours'));
    for (const id of cited) expect(SOURCE_IDS as readonly string[], id).toContain(id);
    for (const id of SOURCE_IDS) expect([...cited], id).toContain(id);
  });

  it('marks what is from memory, what is common practice and what is our own, as its §1.2 says', () => {
    expect(METHODS.match(/from memory/g)?.length ?? 0).toBeGreaterThan(20);
    expect(METHODS).toMatch(/\(common practice, no source\)/);
    expect(METHODS.match(/\(ours[;,)]/g)?.length ?? 0).toBeGreaterThan(20);
  });
});
