/**
 * Atomic file replacement: write a temporary file beside the target, fsync it,
 * rename it over the target, fsync the folder. A reader sees the old or the
 * new file, never a mix; a crash leaves the old one.
 * @module
 */

/** Replace `path` with `data` atomically. */
export async function writeFileAtomic(path: string, data: Uint8Array | string): Promise<void> {
  const bytes = typeof data === "string" ? new TextEncoder().encode(data) : data;
  const tmp = `${path}.tmp-${Deno.pid}`;
  const f = await Deno.open(tmp, { write: true, create: true, truncate: true });
  try {
    let off = 0;
    while (off < bytes.length) off += await f.write(bytes.subarray(off));
    await f.sync();
  } finally {
    f.close();
  }
  await Deno.rename(tmp, path);
  await syncDir(path);
}

async function syncDir(path: string): Promise<void> {
  const dir = path.slice(0, path.lastIndexOf("/")) || ".";
  try {
    const d = await Deno.open(dir, { read: true });
    try {
      await d.sync();
    } finally {
      d.close();
    }
  } catch {
    // Some file systems refuse fsync on folders; the rename is still atomic.
  }
}
