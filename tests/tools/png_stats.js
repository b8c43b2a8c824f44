// Pixel statistics of a PNG (8-bit RGB or RGBA, not interlaced, as rsvg-convert writes them),
// so tests can tell a rendered picture from a blank one. Uses only Node's built-in zlib.
// Prints one JSON line: {"width", "height", "distinct", "non_dominant"} where `distinct` is
// the number of different colours and `non_dominant` the share of pixels that differ from the
// most common colour. Exit code 1 with a message for anything it cannot read.
'use strict';
const fs = require('fs');
const zlib = require('zlib');

function fail(msg) {
  process.stderr.write(`png_stats: ${msg}\n`);
  process.exit(1);
}

const file = process.argv[2];
if (!file) fail('usage: node png_stats.js FILE.png');
const buf = fs.readFileSync(file);
const signature = Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
if (buf.length < 8 || !buf.subarray(0, 8).equals(signature)) fail('not a PNG file');

let pos = 8, width = 0, height = 0, depth = 0, colourType = 0, interlace = 0;
const idat = [];
while (pos + 8 <= buf.length) {
  const len = buf.readUInt32BE(pos);
  const type = buf.toString('ascii', pos + 4, pos + 8);
  const data = buf.subarray(pos + 8, pos + 8 + len);
  if (type === 'IHDR') {
    width = data.readUInt32BE(0);
    height = data.readUInt32BE(4);
    depth = data[8];
    colourType = data[9];
    interlace = data[12];
  } else if (type === 'IDAT') {
    idat.push(data);
  } else if (type === 'IEND') {
    break;
  }
  pos += 12 + len;
}
if (depth !== 8 || (colourType !== 6 && colourType !== 2) || interlace !== 0)
  fail(`unsupported PNG: bit depth ${depth}, colour type ${colourType}, interlace ${interlace}`);
const bpp = colourType === 6 ? 4 : 3;
const raw = zlib.inflateSync(Buffer.concat(idat));
const stride = width * bpp;
if (raw.length !== height * (stride + 1)) fail('image data has the wrong length');

const out = Buffer.alloc(height * stride);
for (let y = 0; y < height; ++y) {
  const filter = raw[y * (stride + 1)];
  const line = raw.subarray(y * (stride + 1) + 1, (y + 1) * (stride + 1));
  for (let x = 0; x < stride; ++x) {
    const a = x >= bpp ? out[y * stride + x - bpp] : 0;
    const b = y > 0 ? out[(y - 1) * stride + x] : 0;
    const c = x >= bpp && y > 0 ? out[(y - 1) * stride + x - bpp] : 0;
    let v = line[x];
    switch (filter) {
      case 0: break;
      case 1: v += a; break;
      case 2: v += b; break;
      case 3: v += (a + b) >> 1; break;
      case 4: {
        const p = a + b - c, pa = Math.abs(p - a), pb = Math.abs(p - b), pc = Math.abs(p - c);
        v += pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
        break;
      }
      default: fail(`unknown filter ${filter} on row ${y}`);
    }
    out[y * stride + x] = v & 0xff;
  }
}

const counts = new Map();
for (let i = 0; i < out.length; i += bpp) {
  const key = out.readUIntBE(i, bpp);
  counts.set(key, (counts.get(key) || 0) + 1);
}
let top = 0;
for (const n of counts.values()) top = Math.max(top, n);
const pixels = width * height;
console.log(JSON.stringify({width, height, distinct: counts.size, non_dominant: pixels ? 1 - top / pixels : 0}));
