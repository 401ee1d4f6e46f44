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
