/** The hash of every source file a build depends on (see source-hash.mjs). */
export function sourceHash(root: string): string
