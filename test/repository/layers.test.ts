/**
 * The layer rules of DEVELOPERS.md ("Layers and what each may import"), enforced on the code's own
 * imports: every relative import of pipeline/ and src/ (static, dynamic, re-exports and
 * side-effect imports, types included) goes from a layer to the same or a lower one, the folders
 * documented as pure do no file, process or thread work, and no import cycle joins two files.
 * A new back-edge or cycle fails here with the file and line that made it.
 */
import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, normalize } from 'node:path';
import { ROOT } from '../helpers/cli.ts';

/** Layers from the bottom up: a folder may import its own layer and any layer listed before it. */
const LAYERS: readonly string[] = [
  'pipeline/model',
  'pipeline/infra',
  'pipeline/read',
  'pipeline/physics',
  'pipeline/scenario',
  'pipeline/work',
  'pipeline/reduce',
  'pipeline/climate',
  'pipeline/regions',
  'pipeline/formats',
  'pipeline/config',
  'pipeline/publish',
  'pipeline/schedule',
  'src',
  'pipeline/demo',
  'pipeline/run',
  'pipeline/commands',
  'pipeline/cli.ts',
];

/** Folders of pure functions: no files, processes or threads (those belong to read, formats, run, commands). */
const PURE = ['pipeline/physics', 'pipeline/work', 'pipeline/reduce', 'pipeline/climate', 'pipeline/regions', 'pipeline/scenario', 'pipeline/schedule'];
const IMPURE_MODULES = /^node:(fs|fs\/promises|worker_threads|child_process|cluster|net|http|https)$/;

interface Import {
  from: string;
  line: number;
  to: string;
}

function sourceFiles(dir: string): string[] {
  const out: string[] = [];
  for (const name of readdirSync(join(ROOT, dir))) {
    const rel = `${dir}/${name}`;
    if (statSync(join(ROOT, rel)).isDirectory()) out.push(...sourceFiles(rel));
    else if (/\.(ts|mts|astro)$/.test(name) && !name.endsWith('.d.ts')) out.push(rel);
  }
  return out;
}

const IMPORT_RE = /(?:^|[\s;])(?:import|export)\s+(?:type\s+)?(?:[^'";]*?\sfrom\s+)?['"]([^'"]+)['"]|import\(\s*['"]([^'"]+)['"]\s*\)/g;

function importsOf(file: string): Import[] {
  const text = readFileSync(join(ROOT, file), 'utf8');
  const out: Import[] = [];
  for (const m of text.matchAll(IMPORT_RE)) {
    const spec = m[1] ?? m[2];
    const line = text.slice(0, m.index).split('\n').length;
    out.push({ from: file, line, to: spec.startsWith('.') ? normalize(join(dirname(file), spec)) : spec });
  }
  return out;
}

function layerOf(path: string): number {
  let best = -1;
  let bestLen = -1;
  LAYERS.forEach((l, i) => {
    if ((path === l || path.startsWith(`${l}/`)) && l.length > bestLen) {
      best = i;
      bestLen = l.length;
    }
  });
  return best;
}

/** The imports that go up the layers, in words. */
function backEdges(imports: readonly Import[]): string[] {
  return imports
    .filter((i) => layerOf(i.to) > layerOf(i.from))
    .map((i) => `${i.from}:${i.line} imports ${i.to} (${LAYERS[layerOf(i.from)]} may not import ${LAYERS[layerOf(i.to)]})`);
}

const FILES = [...sourceFiles('pipeline'), ...sourceFiles('src')];
const IMPORTS = FILES.flatMap(importsOf);
const LOCAL = IMPORTS.filter((i) => i.to.startsWith('pipeline/') || i.to.startsWith('src/'));

describe('the layer rules of DEVELOPERS.md', () => {
  it('every source file of pipeline/ and src/ belongs to a layer', () => {
    expect(FILES.filter((f) => layerOf(f) < 0)).toEqual([]);
    expect(FILES.length).toBeGreaterThan(200);
  });

  it('no file imports a layer above its own (the data flow has no back-edges)', () => {
    expect(backEdges(LOCAL)).toEqual([]);
  });

  it('the pure folders do no file, process or thread work', () => {
    const bad = IMPORTS.filter((i) => PURE.some((p) => i.from.startsWith(`${p}/`)) && IMPURE_MODULES.test(i.to)).map(
      (i) => `${i.from}:${i.line} imports ${i.to}`,
    );
    expect(bad).toEqual([]);
  });

  it('no two files import each other, directly or through others (no import cycle)', () => {
    const graph = new Map<string, string[]>();
    const known = new Set(FILES);
    for (const i of LOCAL) if (known.has(i.to) && i.to !== i.from) graph.set(i.from, [...(graph.get(i.from) ?? []), i.to]);
    // Tarjan's strongly connected components: any component of more than one file is a cycle.
    let index = 0;
    const idx = new Map<string, number>();
    const low = new Map<string, number>();
    const stack: string[] = [];
    const on = new Set<string>();
    const cycles: string[][] = [];
    const visit = (v: string) => {
      idx.set(v, index);
      low.set(v, index++);
      stack.push(v);
      on.add(v);
      for (const w of graph.get(v) ?? []) {
        if (!idx.has(w)) {
          visit(w);
          low.set(v, Math.min(low.get(v)!, low.get(w)!));
        } else if (on.has(w)) low.set(v, Math.min(low.get(v)!, idx.get(w)!));
      }
      if (low.get(v) === idx.get(v)) {
        const comp: string[] = [];
        let w: string;
        do {
          w = stack.pop()!;
          on.delete(w);
          comp.push(w);
        } while (w !== v);
        if (comp.length > 1) cycles.push(comp.sort());
      }
    };
    for (const f of FILES) if (!idx.has(f)) visit(f);
    expect(cycles).toEqual([]);
  });

  it('finds a back-edge when there is one (the checker is not blind)', () => {
    const probe: Import = { from: 'pipeline/physics/kernel.ts', line: 7, to: 'pipeline/run/plan-stage.ts' };
    expect(backEdges([probe])).toEqual(['pipeline/physics/kernel.ts:7 imports pipeline/run/plan-stage.ts (pipeline/physics may not import pipeline/run)']);
    expect(backEdges([{ from: 'src/pages/index.astro', line: 3, to: 'pipeline/publish/manifest.ts' }])).toEqual([]);
    // It reads side-effect imports (the catalogue), re-exports, type imports and dynamic imports.
    expect(IMPORTS.filter((i) => i.from === 'pipeline/commands/catalogue.ts').length).toBeGreaterThan(10);
    expect(IMPORTS.some((i) => i.from === 'pipeline/commands/errors.ts' && i.to === 'pipeline/commands/catalogue.ts')).toBe(true);
  });

  it('the layers listed here are the ones DEVELOPERS.md documents, in the same order', () => {
    const doc = readFileSync(join(ROOT, 'DEVELOPERS.md'), 'utf8');
    const section = doc.slice(doc.indexOf('## Layers and what each may import'));
    const listed = [...section.slice(0, section.indexOf('\n## ', 5)).matchAll(/^\d+\. `([^`]+)`/gm)].map((m) => m[1]);
    expect(listed).toEqual(LAYERS);
  });
});
