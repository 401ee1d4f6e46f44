import { crc32 as zlibCrc32 } from 'node:zlib'
import sharp from 'sharp'
import type { ApiClient } from './api'

/** A real PNG photo, drawn for the test, with a colour so different photos differ. */
export function testPng(width = 64, height = 48, seed = 90) {
  return sharp({ create: { width, height, channels: 3, background: { r: seed % 256, g: (seed * 7) % 256, b: (seed * 13) % 256 } } }).png().toBuffer()
}

export async function uploadPhoto(client: ApiClient, coveringId: number, kind = 'whole', data?: Uint8Array, fileName = 'photo.png') {
  const form = new FormData()
  form.append('kind', kind)
  form.append('file', new Blob([new Uint8Array(data ?? await testPng(64, 48, coveringId))]), fileName)
  const r = await client.request('POST', `/api/coverings/${coveringId}/photos`, form)
  if (r.status !== 201) throw new Error(`photo upload failed: ${r.status} ${JSON.stringify(r.body)}`)
  return r.body as { id: number, sha256: string, url: string, thumbUrl: string | null }
}

/** A JPEG with the given EXIF capture time, written as the camera would (`YYYY:MM:DD HH:MM:SS`). */
export function jpegTakenAt(dateTimeOriginal: string, width = 320, height = 240) {
  return sharp({ create: { width, height, channels: 3, background: '#5a6b7c' } })
    .jpeg().withExif({ IFD0: { Make: 'TestCam' }, IFD2: { DateTimeOriginal: dateTimeOriginal } }).toBuffer()
}

function box(kind: string, body: Uint8Array, declared?: number) {
  const head = Buffer.alloc(8)
  head.writeUInt32BE(declared ?? 8 + body.byteLength, 0)
  head.write(kind, 4, 'latin1')
  return Buffer.concat([head, body])
}
const ftypHeic = () => box('ftyp', Buffer.from('heic\0\0\0\0mif1heic', 'latin1'))

/** Sets a PNG's IHDR width and height and fixes the chunk's CRC, so the header itself is valid. */
function pngDeclaring(png: Buffer, width: number, height: number) {
  const out = Buffer.from(png)
  out.writeUInt32BE(width, 16)
  out.writeUInt32BE(height, 20)
  out.writeUInt32BE(zlibCrc32(out.subarray(12, 29)), 29)
  return out
}

/** Sets a baseline JPEG's frame size (SOF0) without touching the rest of the file. */
function jpegDeclaring(jpeg: Buffer, width: number, height: number) {
  const out = Buffer.from(jpeg)
  for (let i = 2; i + 9 < out.length;) {
    if (out[i] !== 0xFF) break
    const marker = out[i + 1]!
    if (marker === 0xC0 || marker === 0xC2) {
      out.writeUInt16BE(height, i + 5)
      out.writeUInt16BE(width, i + 7)
      return out
    }
    i += 2 + out.readUInt16BE(i + 2)
  }
  throw new Error('no frame header in the JPEG')
}

export interface HostileFile { name: string, data: Buffer, status: 413 | 415, fileName: string }

/**
 * Files that look like photos and are not, or that would make a reader loop, run out of memory or take minutes:
 * each must be refused (413 over a limit, 415 otherwise) without delaying anyone else.
 */
export async function hostileImages(): Promise<HostileFile[]> {
  const jpeg = await sharp({ create: { width: 96, height: 64, channels: 3, background: '#806040' } }).jpeg().toBuffer()
  const png = await sharp({ create: { width: 16, height: 16, channels: 3, background: '#406080' } }).png().toBuffer()
  // Noise, so the cut falls in the middle of the compressed pixels and the header still reads.
  const noisy = await sharp({ create: { width: 320, height: 240, channels: 3, background: '#808080', noise: { type: 'gaussian', mean: 128, sigma: 40 } } }).jpeg().toBuffer()
  const webp = await sharp({ create: { width: 64, height: 64, channels: 3, background: '#408060' } }).webp().toBuffer()
  // Large and valid up to a point: the decoder works through most of the pixels before it finds the cut.
  const wide = await sharp({ create: { width: 9999, height: 9999, channels: 3, background: '#203040' } }).png({ compressionLevel: 9 }).toBuffer()
  const tall = await sharp({ create: { width: 9000, height: 11000, channels: 3, background: '#402030' } }).jpeg({ quality: 50 }).toBuffer()
  const gif = await sharp({ create: { width: 16, height: 16, channels: 3, background: '#604080' } }).gif().toBuffer()
  const html = Buffer.from('<!doctype html><html><body><script>document.title="not a photo"</script><p>Tension device fitted</p></body></html>\n')
  // An ISO-BMFF (HEIC) file: the `ftyp heic` box, then a box whose length field is zero, padded to 224 bytes.
  const zeroBox = Buffer.alloc(224)
  Buffer.concat([ftypHeic(), box('free', Buffer.alloc(0), 0)]).copy(zeroBox)
  return [
    { name: 'HEIC with a zero-length box', data: zeroBox, status: 415, fileName: 'IMG_0001.HEIC' },
    { name: 'HEIC with a box longer than the file', data: Buffer.concat([ftypHeic(), box('meta', Buffer.alloc(40), 0x7FFF_FFF0)]), status: 415, fileName: 'IMG_0002.HEIC' },
    { name: 'HEIC with a 64-bit box length past the file', data: Buffer.concat([ftypHeic(), Buffer.from([0, 0, 0, 1]), Buffer.from('meta'), Buffer.from([0, 0, 0, 0x10, 0, 0, 0, 0]), Buffer.alloc(64)]), status: 415, fileName: 'IMG_0003.HEIC' },
    { name: 'PNG declaring 100000 × 100000 pixels', data: pngDeclaring(png, 100_000, 100_000), status: 413, fileName: 'huge.png' },
    { name: 'JPEG declaring 65000 × 65000 pixels', data: jpegDeclaring(jpeg, 65_000, 65_000), status: 413, fileName: 'huge.jpg' },
    { name: '55 bytes of JPEG, then HTML', data: Buffer.concat([jpeg.subarray(0, 55), html]), status: 415, fileName: 'device.jpg' },
    { name: 'JPEG cut off half-way', data: noisy.subarray(0, Math.floor(noisy.byteLength / 2)), status: 415, fileName: 'half.jpg' },
    { name: 'PNG cut off after its header', data: png.subarray(0, 40), status: 415, fileName: 'cut.png' },
    { name: 'WebP cut off half-way', data: webp.subarray(0, Math.floor(webp.byteLength / 2)), status: 415, fileName: 'half.webp' },
    { name: 'PNG of 9999 × 9999 pixels cut off before its end', data: wide.subarray(0, wide.byteLength - 64), status: 415, fileName: 'wide.png' },
    { name: 'JPEG of 9000 × 11000 pixels cut off before its end', data: tall.subarray(0, Math.floor(tall.byteLength * 0.9)), status: 415, fileName: 'tall.jpg' },
    { name: 'GIF', data: gif, status: 415, fileName: 'anim.gif' },
    { name: 'SVG', data: Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" width="100000" height="100000"><rect width="10" height="10"/></svg>'), status: 415, fileName: 'drawing.svg' },
    { name: 'HTML named .jpg', data: html, status: 415, fileName: 'page.jpg' },
  ]
}
