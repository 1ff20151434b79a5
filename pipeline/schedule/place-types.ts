/** The types of an estimate's place, shared by place.ts and cell-place.ts (no import between them both ways). */

/** Reads a file of the atlas by its path below the site root (`data/calculator/…`). */
export type AtlasLoader = (path: string) => Promise<Uint8Array>;

/** The place an estimate is for, after a point was mapped to a cell. */
export type ResolvedPlace =
  | { kind: 'region'; id: string; name: string }
  | {
      kind: 'cell';
      cell: number;
      /** Centre of the cell [° N, ° E]. */
      centre: { lat: number; lon: number };
      /** The point asked for, when the place was given as a point [° N, ° E]. */
      requested: { lat: number; lon: number } | null;
      /** Great-circle distance from the point to the cell centre [km]; 0 for a cell id. */
      distanceKm: number;
      /** True when the point's own cell is sea and the nearest land cell was taken. */
      movedToLand: boolean;
    };
