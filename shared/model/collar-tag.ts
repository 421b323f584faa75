/**
 * What a collar tag's QR code holds: the address Walk opens for that collar. The server prints
 * it on the tag sheet and the device reads it back, so both use this one definition.
 *
 * A tag printed before its collar exists (a blank tag for a new collar) holds a fresh id the
 * collar takes when it is installed, and may carry the code planned for it: `?code=C-101`.
 */
export const COLLAR_TAG_PATH = '/walk/collars/';

export function collarTagUrl(origin: string, collarId: string, plannedCode: string | null = null): string {
  const base = `${origin.replace(/\/$/, '')}${COLLAR_TAG_PATH}${collarId}`;
  return plannedCode ? `${base}?code=${encodeURIComponent(plannedCode)}` : base;
}

/** What a scanned tag says: the collar id, and the planned code when the tag carries one. */
export interface CollarTag {
  id: string;
  code: string | null;
}

const UUID_AT_END = /([0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12})\/?$/i;
/** Longest planned code a tag may carry: codes are short labels, painted on collars too. */
const MAX_CODE = 40;

/** A tag's planned code as given in its address; empty or over-long codes count as none. */
export function plannedCode(raw: string | null | undefined): string | null {
  const code = raw?.trim() ?? '';
  return code && code.length <= MAX_CODE ? code : null;
}

/**
 * Reads a scanned tag. Tags printed on another server (another origin) still work: only the
 * UUID at the end of the path counts. A bare UUID is accepted too. A planned code that is empty
 * or too long is ignored, never trusted as markup.
 */
export function readCollarTag(text: string): CollarTag | null {
  const trimmed = text.trim();
  let path = trimmed;
  let code: string | null = null;
  try {
    const url = new URL(trimmed);
    path = url.pathname;
    code = plannedCode(url.searchParams.get('code'));
  } catch {
    // not a URL: a bare id or a path
  }
  const m = UUID_AT_END.exec(path);
  return m ? { id: m[1].toLowerCase(), code } : null;
}

/** The collar id in a scanned tag (see readCollarTag). */
export function collarIdFromTag(text: string): string | null {
  return readCollarTag(text)?.id ?? null;
}

/** Planned codes for a sheet of blank tags: prefix + running number, zero-padded to `digits` (N-07, N-08, …). */
export function plannedTagCodes(prefix: string, first: number, digits: number, count: number): string[] {
  return Array.from({ length: count }, (_, i) => `${prefix}${String(first + i).padStart(digits, '0')}`);
}

/** The short form of a tag's id printed under a blank tag's QR code, for reading it out by voice. */
export const shortTagId = (id: string) => id.slice(0, 8);
