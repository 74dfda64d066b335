# Prototype measurement (not shipped): the deflate cost of a written workbook's parts,
# serial at zip level 1 (as saving runs today) vs the parts deflated in parallel, vs large
# parts split into 4 MiB blocks deflated in parallel and joined (pigz-style: Z_SYNC_FLUSH
# per block, the last block Z_FINISH; raw deflate streams so joined = one valid stream),
# vs leaner sheet XML (cell references r="..." dropped, optional in SpreadsheetML).
import sys, time, zipfile, zlib, re
from concurrent.futures import ThreadPoolExecutor
path = sys.argv[1]
z = zipfile.ZipFile(path)
parts = [(i.filename, z.read(i.filename)) for i in z.infolist()]
total = sum(len(d) for _, d in parts)
def deflate(data):
    c = zlib.compressobj(1, zlib.DEFLATED, -15)
    return c.compress(data) + c.flush()
def block(args):
    data, last = args
    c = zlib.compressobj(1, zlib.DEFLATED, -15)
    return c.compress(data) + c.flush(zlib.Z_FINISH if last else zlib.Z_SYNC_FLUSH)
def blocks(data, size=4 << 20):
    n = max(1, (len(data) + size - 1) // size)
    return [(data[k*size:(k+1)*size], k == n - 1) for k in range(n)]
def check(data, comp):
    assert zlib.decompress(comp, -15) == data
res = {}
t = time.perf_counter(); out = [deflate(d) for _, d in parts]; res['serial'] = time.perf_counter() - t
ser_bytes = sum(len(o) for o in out)
with ThreadPoolExecutor(2) as ex:
    t = time.perf_counter(); out = list(ex.map(deflate, [d for _, d in parts])); res['parts-parallel'] = time.perf_counter() - t
    t = time.perf_counter()
    joined = []
    for _, d in parts:
        joined.append(b''.join(ex.map(block, blocks(d))))
        zlib.crc32(d)
    res['blocks-parallel'] = time.perf_counter() - t
    blk_bytes = sum(len(o) for o in joined)
    for (_, d), o in zip(parts, joined):
        check(d, o)
    lean = [re.sub(rb' r="[A-Z]+[0-9]+"', b'', d) if n.startswith('xl/worksheets/') else d for n, d in parts]
    lean_total = sum(len(d) for d in lean)
    t = time.perf_counter()
    for d in lean:
        b''.join(ex.map(block, blocks(d)))
        zlib.crc32(d)
    res['lean+blocks-parallel'] = time.perf_counter() - t
print(f"{path}: {len(parts)} parts, {total/1e6:.0f} MB XML, deflated {ser_bytes/1e6:.0f} MB serial / {blk_bytes/1e6:.0f} MB in blocks; lean XML {lean_total/1e6:.0f} MB")
for k, v in res.items():
    print(f"  {k:>22}: {v:6.2f} s  (serial / this = {res['serial']/v:.2f})")
