// Photo files waiting for signal, kept in this browser's IndexedDB (localStorage cannot hold files).
const DB = 'tautline-photos'
const STORE = 'waiting'

let opening: Promise<IDBDatabase> | null = null

function open(): Promise<IDBDatabase> {
  opening ??= new Promise((resolve, reject) => {
    const req = indexedDB.open(DB, 1)
    req.onupgradeneeded = () => req.result.createObjectStore(STORE)
    req.onsuccess = () => resolve(req.result)
    req.onerror = () => {
      opening = null
      reject(req.error)
    }
  })
  return opening
}

async function run<T>(mode: IDBTransactionMode, work: (store: IDBObjectStore) => IDBRequest<T>): Promise<T> {
  const db = await open()
  return new Promise((resolve, reject) => {
    const req = work(db.transaction(STORE, mode).objectStore(STORE))
    req.onsuccess = () => resolve(req.result)
    req.onerror = () => reject(req.error)
  })
}

/** Keeps a photo file on this phone until it is stored; false when the browser refuses (private mode, full). */
export async function keepPhotoFile(localId: string, file: Blob): Promise<boolean> {
  try {
    await run('readwrite', s => s.put(file, localId))
    return true
  }
  catch {
    return false
  }
}

export async function readPhotoFile(localId: string): Promise<Blob | null> {
  try {
    return (await run<Blob | undefined>('readonly', s => s.get(localId) as IDBRequest<Blob | undefined>)) ?? null
  }
  catch {
    return null
  }
}

export async function dropPhotoFile(localId: string): Promise<void> {
  await run('readwrite', s => s.delete(localId)).catch(() => undefined)
}
