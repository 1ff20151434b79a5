import { describe, expect, it } from 'vitest';
import { readdirSync, readFileSync } from 'node:fs';
import { makeCellClimate } from '../../pipeline/demo/cell-climate.ts';
import { pointInRing, ringIsSimple, ringSignedArea } from '../../pipeline/demo/geometry.ts';
import { regionFiles } from '../../pipeline/demo/regions-geojson.ts';
import { CENTRE, DEFAULT_GRID, DISTRICTS, OUTLINE, SMALL_GRID, placeGrid } from '../../pipeline/demo/territory.ts';
import { parseRegionFile } from '../../pipeline/regions/parse-regions.ts';

const REGIONS_DIR = new URL('../../content/regions/', import.meta.url);

describe('the invented territory and its districts', () => {
  it('the coastline is a simple counter-clockwise ring on open ocean at 16–24° N, 140–150° W', () => {
    expect(ringIsSimple(OUTLINE)).toBe(true);
    expect(ringSignedArea(OUTLINE)).toBeGreaterThan(0);
    for (const [lon, lat] of OUTLINE) {
      expect(lat).toBeGreaterThan(16);
      expect(lat).toBeLessThan(24);
      expect(lon).toBeGreaterThan(-150);
      expect(lon).toBeLessThan(-140);
    }
  });

  it('every district ring is closed, simple and counter-clockwise (RFC 7946 right-hand rule)', () => {
    expect(DISTRICTS.length).toBeGreaterThanOrEqual(4);
    expect(DISTRICTS.length).toBeLessThanOrEqual(6);
    for (const d of DISTRICTS) {
      expect(d.ring[0]).toEqual(d.ring[d.ring.length - 1]);
      expect(ringIsSimple(d.ring.slice(0, -1))).toBe(true);
      expect(ringSignedArea(d.ring)).toBeGreaterThan(0);
      expect(d.id).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/);
    }
    expect(new Set(DISTRICTS.map((d) => d.kind))).toEqual(new Set(['coast', 'basin', 'upland']));
  });

  it('the districts tile the island: each point of a fine lattice on land lies in exactly one district, each point at sea in none', () => {
    let land = 0;
    const wrong: string[] = [];
    for (let lat = 16.0; lat <= 24.2; lat += 0.0473) {
      for (let lon = -150.2; lon <= -141.4; lon += 0.0511) {
        const inIsland = pointInRing(lon, lat, OUTLINE);
        let n = 0;
        for (const d of DISTRICTS) if (pointInRing(lon, lat, d.ring)) n++;
        if (n !== (inIsland ? 1 : 0)) wrong.push(`${lon},${lat}: ${n}`);
        if (inIsland) land++;
      }
    }
    expect(wrong).toEqual([]);
    expect(land).toBeGreaterThan(10000);
    // the district areas add up to the island's area (shoelace)
    const sum = DISTRICTS.reduce((s, d) => s + ringSignedArea(d.ring), 0);
    expect(sum).toBeCloseTo(ringSignedArea(OUTLINE), 9);
  });

  it('the default grid has 900–1100 cells, at least 600 of them land (lsm ≥ 0.5), and sea all round its edge', () => {
    const g = placeGrid(DEFAULT_GRID);
    expect(Array.from(g.lat.slice(0, 2))).toEqual([24, 23.75]);
    expect(Array.from(g.lon360.slice(0, 2))).toEqual([210, 210.25]);
    const cc = makeCellClimate(g);
    expect(cc.nCells).toBeGreaterThanOrEqual(900);
    expect(cc.nCells).toBeLessThanOrEqual(1100);
    const landCells = cc.landFraction.filter((f) => f >= 0.5).length;
    expect(landCells).toBeGreaterThanOrEqual(600);
    for (let i = 0; i < g.nLat; i++) {
      expect(cc.landFraction[i * g.nLon]).toBe(0);
      expect(cc.landFraction[i * g.nLon + g.nLon - 1]).toBe(0);
    }
    for (let j = 0; j < g.nLon; j++) {
      expect(cc.landFraction[j]).toBe(0);
      expect(cc.landFraction[(g.nLat - 1) * g.nLon + j]).toBe(0);
    }
    // every land cell's centre lies in a district (the districts cover the land mask)
    for (let c = 0; c < cc.nCells; c++) {
      if (cc.landFraction[c] < 0.75) continue;
      expect(DISTRICTS.some((d) => pointInRing(cc.lon[c], cc.lat[c], d.ring))).toBe(true);
    }
  });

  it('every district lies inside both the default and the small grid (within the outer cell edges)', () => {
    for (const spec of [DEFAULT_GRID, SMALL_GRID]) {
      const g = placeGrid(spec);
      const half = spec.resolution / 2;
      const north = g.lat[0] + half;
      const south = g.lat[g.nLat - 1] - half;
      const west = g.lon360[0] - 360 - half;
      const east = g.lon360[g.nLon - 1] - 360 + half;
      for (const d of DISTRICTS)
        for (const [lon, lat] of d.ring) {
          expect(lat).toBeLessThan(north);
          expect(lat).toBeGreaterThan(south);
          expect(lon).toBeGreaterThan(west);
          expect(lon).toBeLessThan(east);
        }
    }
  });

  it('the small test grid is 8 × 10 cells around the island centre with land and sea cells', () => {
    const cc = makeCellClimate(placeGrid(SMALL_GRID));
    expect(cc.nCells).toBe(80);
    const land = cc.landFraction.filter((f) => f >= 0.5).length;
    expect(land).toBeGreaterThan(5);
    expect(land).toBeLessThan(60);
    expect(Math.abs(cc.lat[44] - CENTRE[1])).toBeLessThan(1);
  });

  it('the committed content/regions/*.geojson files are exactly what territory.ts produces', () => {
    const files = regionFiles();
    const committed = readdirSync(REGIONS_DIR)
      .filter((f) => f.endsWith('.geojson'))
      .sort();
    expect(committed).toEqual([...files.keys()].sort());
    for (const [name, text] of files) expect(readFileSync(new URL(name, REGIONS_DIR), 'utf8')).toBe(text);
  });

  it('the pipeline region parser accepts every district file with its id and name', () => {
    for (const [name, text] of regionFiles()) {
      const regions = parseRegionFile(text, `content/regions/${name}`);
      expect(regions.length).toBe(1);
      expect(`${regions[0].id}.geojson`).toBe(name);
      expect(regions[0].name.length).toBeGreaterThan(0);
    }
  });
});
