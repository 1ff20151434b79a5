/**
 * A single-band Float32 GeoTIFF in EPSG:4326 for GIS downloads, written byte by byte:
 * baseline TIFF 6.0 (Adobe 1992), little-endian, uncompressed internal tiles of 256 × 256 pixels
 * (TIFF 6.0 §15, tags 322–325; one smaller tile for a small grid, {@link tileEdge}), SampleFormat 3 (IEEE float), and for grids wider or taller than
 * {@link OVERVIEW_FROM} pixels reduced-resolution overviews (TIFF 6.0 NewSubfileType = 1, each half
 * the size of the one before, the mean of the finite pixels of each 2 × 2 block) down to one tile;
 * GeoTIFF 1.1 (OGC 19-008r4) tags ModelPixelScale (33550), ModelTiepoint (33922) and
 * GeoKeyDirectory (34735) with GTModelType = 2 (geographic), GTRasterType = 1 (PixelIsArea),
 * GeographicType = 4326, GeogAngularUnits = 9102 (degree); GDAL's private tags GDAL_METADATA
 * (42112, XML with units and description) and GDAL_NODATA (42113, the no-data value as text).
 * Tag numbers and key codes: TIFF 6.0 §8 and OGC 19-008r4 Annex (from memory; checked by reading
 * the file back with geotiff.js in test/publish/layers).
 *
 * Browser-free and pure: bytes in memory out, no node-only modules.
 */
import { layerGeometry, type LayerGridInput } from './layer-grid.ts';
import { LayerNoDataValueInvalid } from './errors.ts';

export interface GeoTiffMeta {
  /** Units of the values, e.g. `h`, `degC`. */
  units: string;
  /** What the band holds, e.g. "hours with WBGT above the limit, moderate work, July, median year". */
  description: string;
  /**
   * Value written for no-data cells (NaN in the grid) [units], announced in GDAL_NODATA. Default:
   * NaN stays NaN and GDAL_NODATA is "nan".
   */
  noData?: number;
}

const SHORT = 3;
const LONG = 4;
const ASCII = 2;
const DOUBLE = 12;
const TYPE_SIZE: Record<number, number> = { [ASCII]: 1, [SHORT]: 2, [LONG]: 4, [DOUBLE]: 8 };

interface Tag {
  code: number;
  type: number;
  values: number[] | Uint8Array;
}

/**
 * Tile edge [px] (a multiple of 16, TIFF 6.0 §15) of images that span more than one tile; a
 * smaller image is one tile just large enough (its longer side rounded up to 16), so a small grid
 * does not carry a 256 × 256 tile of padding.
 */
export const TILE_SIZE = 256;

/** The tile edge for an image of w × h pixels [px]. */
export function tileEdge(w: number, h: number): number {
  return Math.min(TILE_SIZE, Math.ceil(Math.max(w, h) / 16) * 16);
}
/** Grids larger than this in either dimension [px] get overviews. */
export const OVERVIEW_FROM = 512;

function asciiBytes(s: string): Uint8Array {
  const b = new TextEncoder().encode(s);
  const out = new Uint8Array(b.length + 1); // NUL-terminated (TIFF 6.0 §2, ASCII type)
  out.set(b);
  return out;
}

function xmlEscape(s: string): string {
  return s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/>/g, '&gt;').replace(/"/g, '&quot;');
}

/** GDAL's metadata XML: band 0 unit type and description, plus dataset-level items. */
function gdalMetadataXml(meta: GeoTiffMeta): string {
  const u = xmlEscape(meta.units);
  const d = xmlEscape(meta.description);
  return (
    '<GDALMetadata>' +
    `<Item name="units">${u}</Item>` +
    `<Item name="description">${d}</Item>` +
    `<Item name="UNITTYPE" sample="0" role="unittype">${u}</Item>` +
    `<Item name="DESCRIPTION" sample="0" role="description">${d}</Item>` +
    '</GDALMetadata>'
  );
}

/**
 * GeoTIFF bytes of a layer grid: width = columns, height = rows, north-up (image row 0 is the
 * grid's northernmost row), tiepoint at the north-west cell edge, pixel scale = grid steps [°].
 * Throws the catalogued grid errors of layerGeometry and LayerNoDataValueInvalid when `noData`
 * is not finite or is the value of some cell.
 */
export function writeGeoTiff(grid: LayerGridInput, meta: GeoTiffMeta): Uint8Array {
  const g = layerGeometry(grid);
  const { nx, ny } = g;
  const noData = meta.noData;
  if (noData !== undefined) {
    if (!Number.isFinite(noData)) throw LayerNoDataValueInvalid({ noData, reason: 'must be finite (leave it out to keep NaN)' });
    const f32 = Math.fround(noData);
    for (let i = 0; i < grid.values.length; i++) {
      if (grid.values[i] === f32)
        throw LayerNoDataValueInvalid(
          { noData, reason: `the cell at grid row ${Math.floor(i / nx)}, column ${i % nx} (row 0 the southernmost) has this value` },
          { variable: 'values' },
        );
    }
  }

  // The image, north-up (image row i is grid row ny − 1 − i), no-data written as given.
  const full = new Float32Array(nx * ny);
  for (let i = 0; i < ny; i++) {
    const src = (ny - 1 - i) * nx;
    for (let x = 0; x < nx; x++) {
      const val = grid.values[src + x];
      full[i * nx + x] = noData !== undefined && Number.isNaN(val) ? noData : val;
    }
  }
  const images: Array<{ w: number; h: number; px: Float32Array }> = [{ w: nx, h: ny, px: full }];
  if (Math.max(nx, ny) > OVERVIEW_FROM) {
    while (Math.max(images[images.length - 1].w, images[images.length - 1].h) > TILE_SIZE) {
      images.push(halve(images[images.length - 1], noData));
    }
  }

  const geoKeys = [
    [1024, 0, 1, 2], // GTModelTypeGeoKey = ModelTypeGeographic
    [1025, 0, 1, 1], // GTRasterTypeGeoKey = RasterPixelIsArea
    [2048, 0, 1, 4326], // GeographicTypeGeoKey = EPSG 4326 (WGS 84)
    [2054, 0, 1, 9102], // GeogAngularUnitsGeoKey = Angular_Degree
  ];
  const edge = tileEdge(nx, ny);
  const ifds = images.map((im, level) => {
    const across = Math.ceil(im.w / edge);
    const down = Math.ceil(im.h / edge);
    const nTiles = across * down;
    const tags: Tag[] = [
      ...(level > 0 ? [{ code: 254, type: LONG, values: [1] }] : []), // NewSubfileType: reduced-resolution image
      { code: 256, type: LONG, values: [im.w] }, // ImageWidth
      { code: 257, type: LONG, values: [im.h] }, // ImageLength
      { code: 258, type: SHORT, values: [32] }, // BitsPerSample
      { code: 259, type: SHORT, values: [1] }, // Compression: none
      { code: 262, type: SHORT, values: [1] }, // PhotometricInterpretation: BlackIsZero
      ...(level === 0 ? [{ code: 270, type: ASCII, values: asciiBytes(meta.description) }] : []), // ImageDescription
      { code: 277, type: SHORT, values: [1] }, // SamplesPerPixel
      { code: 284, type: SHORT, values: [1] }, // PlanarConfiguration: chunky
      { code: 322, type: SHORT, values: [edge] }, // TileWidth
      { code: 323, type: SHORT, values: [edge] }, // TileLength
      { code: 324, type: LONG, values: new Array<number>(nTiles).fill(0) }, // TileOffsets (patched below)
      { code: 325, type: LONG, values: new Array<number>(nTiles).fill(edge * edge * 4) }, // TileByteCounts
      { code: 339, type: SHORT, values: [3] }, // SampleFormat: IEEE floating point
      ...(level === 0
        ? [
            { code: 33550, type: DOUBLE, values: [g.dLon, g.dLat, 0] }, // ModelPixelScaleTag
            { code: 33922, type: DOUBLE, values: [0, 0, 0, g.west, g.north, 0] }, // ModelTiepointTag
            { code: 34735, type: SHORT, values: [1, 1, 0, geoKeys.length, ...geoKeys.flat()] }, // GeoKeyDirectoryTag
            { code: 42112, type: ASCII, values: asciiBytes(gdalMetadataXml(meta)) }, // GDAL_METADATA
          ]
        : []),
      { code: 42113, type: ASCII, values: asciiBytes(noData === undefined ? 'nan' : String(noData)) }, // GDAL_NODATA
    ];
    return { im, tags, across, down, nTiles, offset: 0, next: 0 };
  });

  // Layout: header (8) | per image: IFD (2 + 12·n + 4), its out-of-line values | tiles (4-byte aligned).
  let at = 8;
  const valueOffset = new Map<Tag, number>();
  for (const ifd of ifds) {
    at += at & 1; // IFDs start on a word boundary (TIFF 6.0 §2)
    ifd.offset = at;
    at += 2 + 12 * ifd.tags.length + 4;
    for (const t of ifd.tags) {
      const size = TYPE_SIZE[t.type] * t.values.length;
      if (size > 4) {
        at += at & 1; // word-aligned values (TIFF 6.0 §2)
        valueOffset.set(t, at);
        at += size;
      }
    }
  }
  let dataOffset = (at + 3) & ~3;
  for (const ifd of ifds) {
    const offsets = ifd.tags.find((t) => t.code === 324)!.values as number[];
    for (let k = 0; k < ifd.nTiles; k++) offsets[k] = dataOffset + k * edge * edge * 4;
    dataOffset += ifd.nTiles * edge * edge * 4;
  }
  ifds.forEach((ifd, i) => (ifd.next = i + 1 < ifds.length ? ifds[i + 1].offset : 0));

  const out = new Uint8Array(dataOffset);
  const v = new DataView(out.buffer);
  out[0] = 0x49; // "II": little-endian
  out[1] = 0x49;
  v.setUint16(2, 42, true);
  v.setUint32(4, ifds[0].offset, true);

  const put = (t: Tag, pos: number): void => {
    for (let i = 0; i < t.values.length; i++) {
      const x = t.values[i];
      if (t.type === ASCII) v.setUint8(pos + i, x);
      else if (t.type === SHORT) v.setUint16(pos + 2 * i, x, true);
      else if (t.type === LONG) v.setUint32(pos + 4 * i, x, true);
      else v.setFloat64(pos + 8 * i, x, true);
    }
  };
  for (const ifd of ifds) {
    v.setUint16(ifd.offset, ifd.tags.length, true);
    ifd.tags.forEach((t, i) => {
      const e = ifd.offset + 2 + 12 * i;
      v.setUint16(e, t.code, true);
      v.setUint16(e + 2, t.type, true);
      v.setUint32(e + 4, t.values.length, true);
      const off = valueOffset.get(t);
      if (off === undefined) put(t, e + 8);
      else {
        v.setUint32(e + 8, off, true);
        put(t, off);
      }
    });
    v.setUint32(ifd.offset + 2 + 12 * ifd.tags.length, ifd.next, true);
    // Tiles, row by row of tiles; pixels past the image's edge are written as no-data.
    const offsets = ifd.tags.find((t) => t.code === 324)!.values as number[];
    const pad = noData ?? NaN;
    const { w, h, px } = ifd.im;
    for (let ty = 0; ty < ifd.down; ty++) {
      for (let tx = 0; tx < ifd.across; tx++) {
        let pos = offsets[ty * ifd.across + tx];
        for (let r = 0; r < edge; r++) {
          const y = ty * edge + r;
          for (let c = 0; c < edge; c++, pos += 4) {
            const x = tx * edge + c;
            v.setFloat32(pos, y < h && x < w ? px[y * w + x] : pad, true);
          }
        }
      }
    }
  }
  return out;
}

/**
 * Half-size image: each pixel the mean of the finite, non-no-data pixels of a 2 × 2 block
 * (no-data when none), the last row or column alone when the size is odd.
 */
function halve(im: { w: number; h: number; px: Float32Array }, noData: number | undefined): { w: number; h: number; px: Float32Array } {
  const w = Math.ceil(im.w / 2);
  const h = Math.ceil(im.h / 2);
  const px = new Float32Array(w * h);
  const nd = noData === undefined ? NaN : Math.fround(noData);
  for (let y = 0; y < h; y++) {
    for (let x = 0; x < w; x++) {
      let sum = 0;
      let n = 0;
      for (let dy = 0; dy < 2; dy++) {
        for (let dx = 0; dx < 2; dx++) {
          const sy = 2 * y + dy;
          const sx = 2 * x + dx;
          if (sy >= im.h || sx >= im.w) continue;
          const val = im.px[sy * im.w + sx];
          if (Number.isFinite(val) && val !== nd) {
            sum += val;
            n++;
          }
        }
      }
      px[y * w + x] = n > 0 ? sum / n : nd;
    }
  }
  return { w, h, px };
}
