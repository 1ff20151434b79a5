/**
 * "Since the previous build" in words (components/WhatChanged.astro): whether the normals a bid
 * uses moved and by how much, and whether the baseline is the same. Pure, so the wording is
 * tested without a site build (test/site/what-changed.test.ts).
 */
import type { BuildChanges } from '../../pipeline/publish/changes.ts';
import { formatFixed } from './format.ts';

const range = (r: readonly [number, number]) => `${r[0]}–${r[1]}`;

/** "none of the 320 moved." / "12 of 320 moved, by up to 4.2 h per year." */
export function normalsMovedWords(n: BuildChanges['normals']): string {
  return n.moved === 0 ? `none of the ${n.compared} moved.` : `${n.moved} of ${n.compared} moved, by up to ${formatFixed(n.largest, 1)} h per year.`;
}

/**
 * Whether the baseline is the same, and if the normals moved with an unchanged baseline, why:
 * "The baseline (2020–2023) is unchanged." / "… is unchanged; the normals moved because input files
 * of it changed." / "The baseline changed from 2020–2023 to 2021–2024, so every normal was recomputed."
 */
export function baselineWords(c: BuildChanges, baseline: readonly [number, number]): string {
  const prev = c.previous!.baseline;
  if (c.baselineChanged) return `The baseline changed from ${range(prev)} to ${range(baseline)}, so every normal was recomputed.`;
  if (c.normals.moved === 0) return `The baseline (${range(baseline)}) is unchanged.`;
  const why = [
    c.inputs.changed.length > 0 ? 'input files changed' : '',
    c.codeChanged ? 'the heathours version changed' : '',
    c.configChanged ? 'the atlas configuration changed' : '',
  ].filter(Boolean);
  return `The baseline (${range(baseline)}) is unchanged; the normals moved because ${why.length > 0 ? why.join(', ') : 'the figures were recomputed'}.`;
}
