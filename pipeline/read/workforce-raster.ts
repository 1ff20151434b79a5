/**
 * A raster of people per pixel (GeoTIFF, EPSG:4326), read window by window with geotiff.js 3.0.5
 * so that only the blocks (strips or tiles) a window touches are read and decoded: memory holds
 * one window, never the whole raster.
 *
 * Checked on opening, each a catalogued error naming the file: a TIFF geotiff.js can decode
 * (WorkforceRasterUnreadable), one band (WorkforceRasterBands), geographic WGS 84 coordinates in
 * degrees (WorkforceRasterCrs, whose hint shows the GDAL command that reprojects it), and a
 * north-up or south-up affine georeference without rotation (WorkforceRasterGeoreference).
 *
 * Georeference (GeoTIFF 1.1, OGC 19-008r4, tags ModelPixelScale 33550, ModelTiepoint 33922,
 * ModelTransformation 34264; from memory, checked against GDAL-written files in
 * test/read/workforce-raster.test.ts): the tiepoint (I, J) → (X, Y) and the scales (Sx, Sy) place
 * column i's west edge at X + (i − I)·Sx and row j's top edge at Y − (j − J)·Sy. A raster whose
 * GTRasterTypeGeoKey says PixelIsPoint has its tiepoint at a pixel centre; it is moved by half a
 * pixel, as GDAL does by default.
 */
import { fromFile, type GeoTIFF, type GeoTIFFImage } from 'geotiff';
import { WorkforceRasterBands, WorkforceRasterCrs, WorkforceRasterGeoreference, WorkforceRasterUnreadable } from './errors.ts';
import type { PixelLayout } from '../model/grid.ts';

/** GeoTIFF key values (OGC 19-008r4 Annex; from memory). */
const MODEL_PROJECTED = 1;
const MODEL_GEOGRAPHIC = 2;
const RASTER_PIXEL_IS_POINT = 2;
const GCS_WGS84 = 4326;
const DATUM_WGS84 = 6326;
const USER_DEFINED = 32767;
const ANGULAR_DEGREE = 9102;

/** A people raster, open for reading by windows. */
export interface WorkforceRaster extends PixelLayout {
  path: string;
  /** The value that marks a pixel without data (GDAL_NODATA), null when none; NaN when it is "nan". */
  noData: number | null;
  /** Rows of one block (strip or tile) [px]: windows read whole blocks of rows. */
  blockRows: number;
  /** Pixel type, e.g. `float32`, `uint16`. */
  sampleType: string;
  /**
   * The pixels of columns [col0, col1) × rows [row0, row1), row-major [people].
   */
  read(col0: number, row0: number, col1: number, row1: number): Promise<ArrayLike<number>>;
  close(): Promise<void>;
}

const SAMPLE_FORMATS: Record<number, string> = { 1: 'uint', 2: 'int', 3: 'float' };

/** Opens and checks a people raster. */
export async function openWorkforceRaster(path: string): Promise<WorkforceRaster> {
  let tiff: GeoTIFF;
  let image: GeoTIFFImage;
  try {
    tiff = await fromFile(path);
    image = await tiff.getImage(0);
  } catch (e) {
    throw WorkforceRasterUnreadable({ path, detail: (e as Error).message }, { file: path });
  }
  try {
    const bands = image.getSamplesPerPixel();
    if (bands !== 1) throw WorkforceRasterBands({ path, bands }, { file: path });
    checkCrs(path, image.getGeoKeys());
    const geo = georeference(path, image);
    const format = SAMPLE_FORMATS[image.getSampleFormat(0)] ?? `format ${image.getSampleFormat(0)}`;
    return {
      path,
      width: image.getWidth(),
      height: image.getHeight(),
      ...geo,
      noData: image.getGDALNoData(),
      blockRows: Math.max(1, image.getTileHeight()),
      sampleType: `${format}${image.getBitsPerSample(0)}`,
      async read(col0, row0, col1, row1) {
        try {
          const r = await image.readRasters({ window: [col0, row0, col1, row1], samples: [0], interleave: true });
          return r as unknown as ArrayLike<number>;
        } catch (e) {
          throw WorkforceRasterUnreadable({ path, detail: `rows ${row0}–${row1 - 1}: ${(e as Error).message}` }, { file: path });
        }
      },
      close: async () => {
        await tiff.close();
      },
    };
  } catch (e) {
    await tiff.close();
    throw e;
  }
}

function checkCrs(path: string, keys: Record<string, unknown> | null): void {
  if (keys === null) throw WorkforceRasterCrs({ path, crs: 'none (a plain TIFF without GeoTIFF keys)' }, { file: path });
  const model = keys.GTModelTypeGeoKey;
  if (model === MODEL_PROJECTED || keys.ProjectedCSTypeGeoKey !== undefined) {
    const code = keys.ProjectedCSTypeGeoKey;
    throw WorkforceRasterCrs(
      { path, crs: code !== undefined && code !== USER_DEFINED ? `projected, EPSG:${code}` : 'a projected (user-defined) coordinate system' },
      { file: path },
    );
  }
  if (model !== MODEL_GEOGRAPHIC) throw WorkforceRasterCrs({ path, crs: `model type ${String(model)} (not geographic)` }, { file: path });
  const gcs = keys.GeographicTypeGeoKey;
  const datum = keys.GeogGeodeticDatumGeoKey;
  const wgs84 = gcs === GCS_WGS84 || ((gcs === undefined || gcs === USER_DEFINED) && datum === DATUM_WGS84);
  if (!wgs84)
    throw WorkforceRasterCrs(
      { path, crs: gcs !== undefined && gcs !== USER_DEFINED ? `geographic, EPSG:${gcs}` : `geographic with datum ${String(datum)}` },
      { file: path },
    );
  const unit = keys.GeogAngularUnitsGeoKey;
  if (unit !== undefined && unit !== ANGULAR_DEGREE)
    throw WorkforceRasterCrs({ path, crs: `EPSG:4326 with angular unit ${String(unit)} (not degrees)` }, { file: path });
}

function georeference(path: string, image: GeoTIFFImage): Pick<WorkforceRaster, 'west' | 'dLon' | 'top' | 'dLatRow'> {
  const fd = image.getFileDirectory();
  const num = (v: unknown): number[] | undefined => (v === undefined || v === null ? undefined : Array.from(v as ArrayLike<number>, Number));
  const scale = num(fd.getValue('ModelPixelScale'));
  const tie = num(fd.getValue('ModelTiepoint'));
  const transform = num(fd.getValue('ModelTransformation'));
  let west: number, dLon: number, top: number, dLatRow: number;
  if (scale && tie && tie.length >= 6) {
    if (!(scale[0] > 0) || !(scale[1] !== 0) || !Number.isFinite(scale[1]))
      throw WorkforceRasterGeoreference({ path, detail: `pixel scale ${scale[0]}, ${scale[1]}` }, { file: path });
    dLon = scale[0];
    dLatRow = -scale[1];
    west = tie[3] - tie[0] * dLon;
    top = tie[4] - tie[1] * dLatRow;
  } else if (transform && transform.length >= 8) {
    if (transform[1] !== 0 || transform[4] !== 0)
      throw WorkforceRasterGeoreference({ path, detail: `a rotated or sheared transformation (terms ${transform[1]}, ${transform[4]})` }, { file: path });
    dLon = transform[0];
    dLatRow = transform[5];
    west = transform[3];
    top = transform[7];
    if (!(dLon > 0) || !(dLatRow !== 0)) throw WorkforceRasterGeoreference({ path, detail: `pixel size ${dLon}, ${dLatRow}` }, { file: path });
  } else {
    throw WorkforceRasterGeoreference({ path, detail: 'no ModelPixelScale with ModelTiepoint, and no ModelTransformation' }, { file: path });
  }
  if (image.getGeoKeys()?.GTRasterTypeGeoKey === RASTER_PIXEL_IS_POINT) {
    west -= dLon / 2;
    top -= dLatRow / 2;
  }
  const south = Math.min(top, top + dLatRow * image.getHeight());
  const north = Math.max(top, top + dLatRow * image.getHeight());
  if (dLon * image.getWidth() > 360 + 1e-6) {
    throw WorkforceRasterGeoreference({ path, detail: `it spans ${dLon * image.getWidth()}° of longitude, more than once around the globe` }, { file: path });
  }
  if (![west, dLon, top, dLatRow].every(Number.isFinite) || south < -90 - 1e-6 || north > 90 + 1e-6 || west < -540 || west + dLon * image.getWidth() > 540) {
    throw WorkforceRasterGeoreference(
      { path, detail: `extent lon ${west} … ${west + dLon * image.getWidth()}, lat ${south} … ${north} is not on the globe in degrees` },
      { file: path },
    );
  }
  return { west, dLon, top, dLatRow };
}
