/**
 * What a collar tag's QR code holds: the address Walk opens for that collar. The server prints
 * it on the tag sheet and the device reads it back, so both use this one definition.
 */
export const COLLAR_TAG_PATH = '/walk/collars/';

export function collarTagUrl(origin: string, collarId: string): string {
  return `${origin.replace(/\/$/, '')}${COLLAR_TAG_PATH}${collarId}`;
}

const UUID_AT_END = /([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})\/?$/i;

/**
 * The collar id in a scanned tag. Tags printed on another server (another origin) still open the
 * collar here: only the UUID at the end of the path counts. A bare UUID is accepted too.
 */
export function collarIdFromTag(text: string): string | null {
  const trimmed = text.trim();
  let path = trimmed;
  try {
    path = new URL(trimmed).pathname;
  } catch {
    // not a URL: a bare id or a path
  }
  const m = UUID_AT_END.exec(path);
  return m ? m[1].toLowerCase() : null;
}
