"""GDAL as a reference reader for the terrain tests, in one long-lived process (Debian's python3-gdal,
GDAL 3.6): one JSON request per line on stdin, one JSON answer per line on stdout.

Requests:
  {"op": "write", "path": P, "type": "Float32", "width": W, "height": H, "values": [...], "nodata": N|null,
   "nan": [k...], "options": ["COMPRESS=DEFLATE", ...], "bands": B, "srs": "EPSG:32633",
   "geotransform": [...], "sparse_blocks": bool}
      writes a GeoTIFF with GDAL's GTiff driver from a MEM dataset (band b holds values + 1000·b);
      with "sparse_blocks", only blocks holding a value other than the no-data value are written
      (SPARSE_OK=TRUE and WriteRaster of those blocks only), so the rest are omitted from the file.
  {"op": "read", "paths": [P...]}
      for each file: {"ok": true, "width", "height", "bands", "type", "nodata", "signedbyte",
      "geotransform", "values": base64 float64 little-endian of band 1} or {"ok": false, "error": ...}.
"""
import base64
import json
import sys

import numpy as np
from osgeo import gdal

gdal.UseExceptions()
gdal.SetConfigOption('GDAL_PAM_ENABLED', 'NO')
gdal.SetConfigOption('GDAL_DISABLE_READDIR_ON_OPEN', 'EMPTY_DIR')
gdal.SetConfigOption('CPL_LOG', '/dev/null')
gdal.PushErrorHandler('CPLQuietErrorHandler')
# Files GDAL opens with more cells than this are not read back (fuzzed sizes can be huge): 'skipped'.
MAX_CELLS = 1 << 20


def write(req):
    w, h, bands = req['width'], req['height'], req.get('bands', 1)
    dtype = gdal.GetDataTypeByName(req['type'])
    mem = gdal.GetDriverByName('MEM').Create('', w, h, bands, dtype)
    if req.get('geotransform'):
        mem.SetGeoTransform(req['geotransform'])
    if req.get('srs'):
        mem.SetProjection(req['srs'])
    base = np.array([np.nan if v is None else v for v in req['values']], dtype=np.float64).reshape(h, w)
    nodata = None if req.get('nodata') is None else float(req['nodata'])
    for k in req.get('nan', []):
        base[k // w, k % w] = np.nan
    for b in range(bands):
        band = mem.GetRasterBand(b + 1)
        if nodata is not None:
            band.SetNoDataValue(nodata)
        band.WriteArray(base + 1000 * b)
    options = list(req.get('options', []))
    if not req.get('sparse_blocks'):
        gdal.GetDriverByName('GTiff').CreateCopy(req['path'], mem, options=options)
        return {'ok': True}
    out = gdal.GetDriverByName('GTiff').Create(req['path'], w, h, bands, dtype, options=options + ['SPARSE_OK=TRUE'])
    out.SetGeoTransform(mem.GetGeoTransform())
    out.SetProjection(mem.GetProjection())
    for b in range(bands):
        src, dst = mem.GetRasterBand(b + 1), out.GetRasterBand(b + 1)
        if nodata is not None:
            dst.SetNoDataValue(nodata)
        bw, bh = dst.GetBlockSize()
        data = src.ReadAsArray()
        for y in range(0, h, bh):
            for x in range(0, w, bw):
                blk = data[y:y + bh, x:x + bw]
                empty = np.all(np.isnan(blk)) if nodata is not None and np.isnan(nodata) else (nodata is not None and np.all(blk == nodata))
                if not empty:
                    dst.WriteArray(blk, x, y)
    out = None
    return {'ok': True}


def read_one(path):
    ds = None
    try:
        ds = gdal.Open(path)
        band = ds.GetRasterBand(1)
        if ds.RasterXSize * ds.RasterYSize > MAX_CELLS:
            return {'ok': False, 'skipped': True, 'error': 'over the oracle\'s %d cells' % MAX_CELLS}
        arr = band.ReadAsArray()
        if arr is None:
            raise RuntimeError('ReadAsArray returned nothing')
        values = arr.astype(np.float64)
        nodata = band.GetNoDataValue()
        gt = ds.GetGeoTransform(can_return_null=True)
        md = band.GetMetadata('IMAGE_STRUCTURE') or {}
        answer = {
            'ok': True, 'width': ds.RasterXSize, 'height': ds.RasterYSize, 'bands': ds.RasterCount,
            'type': gdal.GetDataTypeName(band.DataType),
            'nodata': None if nodata is None else ('nan' if np.isnan(nodata) else nodata if np.isfinite(nodata) else str(nodata)),
            'signedbyte': md.get('PIXELTYPE') == 'SIGNEDBYTE',
            'geotransform': list(gt) if gt else None,
            'values': base64.b64encode(values.astype('<f8').tobytes()).decode('ascii'),
        }
        return answer
    except Exception as err:  # GDAL refused the file: that is an answer too
        return {'ok': False, 'error': str(err)[:300]}
    finally:
        ds = None


for line in sys.stdin:
    req = json.loads(line)
    try:
        if req['op'] == 'write':
            ans = write(req)
        elif req['op'] == 'read':
            ans = {'ok': True, 'results': [read_one(p) for p in req['paths']]}
        else:
            ans = {'ok': False, 'error': 'unknown op'}
    except Exception as err:
        ans = {'ok': False, 'error': str(err)[:500]}
    sys.stdout.write(json.dumps(ans) + '\n')
    sys.stdout.flush()
