/**
 * A single-band Float32 GeoTIFF in EPSG:4326 for GIS downloads, written byte by byte:
 * baseline TIFF 6.0 (Adobe 1992), little-endian, uncompressed strips, SampleFormat 3 (IEEE float);
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

/** Target strip size [bytes]: a few strips for a country grid, one for a small one. */
const STRIP_BYTES = 64 * 1024;

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
      if (grid.values[i] === f32) throw LayerNoDataValueInvalid({ noData, reason: `the cell at grid row ${Math.floor(i / nx)}, column ${i % nx} (row 0 the southernmost) has this value` }, { variable: 'values' });
    }
  }

  const rowBytes = nx * 4;
  const rowsPerStrip = Math.max(1, Math.min(ny, Math.floor(STRIP_BYTES / rowBytes)));
  const nStrips = Math.ceil(ny / rowsPerStrip);
  const stripCounts: number[] = [];
  for (let s = 0; s < nStrips; s++) stripCounts.push(Math.min(rowsPerStrip, ny - s * rowsPerStrip) * rowBytes);

  const geoKeys = [
    [1024, 0, 1, 2], // GTModelTypeGeoKey = ModelTypeGeographic
    [1025, 0, 1, 1], // GTRasterTypeGeoKey = RasterPixelIsArea
    [2048, 0, 1, 4326], // GeographicTypeGeoKey = EPSG 4326 (WGS 84)
    [2054, 0, 1, 9102], // GeogAngularUnitsGeoKey = Angular_Degree
  ];
  const tags: Tag[] = [
    { code: 256, type: LONG, values: [nx] }, // ImageWidth
    { code: 257, type: LONG, values: [ny] }, // ImageLength
    { code: 258, type: SHORT, values: [32] }, // BitsPerSample
    { code: 259, type: SHORT, values: [1] }, // Compression: none
    { code: 262, type: SHORT, values: [1] }, // PhotometricInterpretation: BlackIsZero
    { code: 270, type: ASCII, values: asciiBytes(meta.description) }, // ImageDescription
    { code: 273, type: LONG, values: new Array<number>(nStrips).fill(0) }, // StripOffsets (patched below)
    { code: 277, type: SHORT, values: [1] }, // SamplesPerPixel
    { code: 278, type: LONG, values: [rowsPerStrip] }, // RowsPerStrip
    { code: 279, type: LONG, values: stripCounts }, // StripByteCounts
    { code: 284, type: SHORT, values: [1] }, // PlanarConfiguration: chunky
    { code: 339, type: SHORT, values: [3] }, // SampleFormat: IEEE floating point
    { code: 33550, type: DOUBLE, values: [g.dLon, g.dLat, 0] }, // ModelPixelScaleTag
    { code: 33922, type: DOUBLE, values: [0, 0, 0, g.west, g.north, 0] }, // ModelTiepointTag
    { code: 34735, type: SHORT, values: [1, 1, 0, geoKeys.length, ...geoKeys.flat()] }, // GeoKeyDirectoryTag
    { code: 42112, type: ASCII, values: asciiBytes(gdalMetadataXml(meta)) }, // GDAL_METADATA
    { code: 42113, type: ASCII, values: asciiBytes(noData === undefined ? 'nan' : String(noData)) }, // GDAL_NODATA
  ];

  // Layout: header (8) | IFD (2 + 12·n + 4) | out-of-line tag values | strips (4-byte aligned).
  const ifdOffset = 8;
  const ifdSize = 2 + 12 * tags.length + 4;
  let extra = ifdOffset + ifdSize;
  const valueOffset = new Map<Tag, number>();
  for (const t of tags) {
    const size = TYPE_SIZE[t.type] * t.values.length;
    if (size > 4) {
      extra += extra & 1; // word-aligned values (TIFF 6.0 §2)
      valueOffset.set(t, extra);
      extra += size;
    }
  }
  const dataOffset = (extra + 3) & ~3;
  const offsets = tags.find((t) => t.code === 273)!.values as number[];
  for (let s = 0; s < nStrips; s++) offsets[s] = dataOffset + s * rowsPerStrip * rowBytes;

  const out = new Uint8Array(dataOffset + ny * rowBytes);
  const v = new DataView(out.buffer);
  out[0] = 0x49; // "II": little-endian
  out[1] = 0x49;
  v.setUint16(2, 42, true);
  v.setUint32(4, ifdOffset, true);
  v.setUint16(ifdOffset, tags.length, true);

  const put = (t: Tag, at: number): void => {
    for (let i = 0; i < t.values.length; i++) {
      const x = t.values[i];
      if (t.type === ASCII) v.setUint8(at + i, x);
      else if (t.type === SHORT) v.setUint16(at + 2 * i, x, true);
      else if (t.type === LONG) v.setUint32(at + 4 * i, x, true);
      else v.setFloat64(at + 8 * i, x, true);
    }
  };
  tags.forEach((t, i) => {
    const e = ifdOffset + 2 + 12 * i;
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
  v.setUint32(ifdOffset + 2 + 12 * tags.length, 0, true); // no next IFD

  // Pixels, north-up: image row i is grid row ny − 1 − i.
  for (let i = 0; i < ny; i++) {
    const src = (ny - 1 - i) * nx;
    let at = dataOffset + i * rowBytes;
    for (let x = 0; x < nx; x++, at += 4) {
      const val = grid.values[src + x];
      v.setFloat32(at, noData !== undefined && Number.isNaN(val) ? noData : val, true);
    }
  }
  return out;
}
